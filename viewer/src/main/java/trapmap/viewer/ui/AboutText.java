package trapmap.viewer.ui;

/** The text of the About box (Help ▸ About, F1); no Swing, so that it can be checked headless. */
final class AboutText {
    private AboutText() {
    }

    /** The About box: version (as {@code trapmap --version} prints it), Java runtime, licence, meaning and caution. */
    static String html() {
        return "<html><body style='width: 420px'>"
                + "<b>" + trapmap.shared.Version.LINE + "</b><br>" + trapmap.shared.Version.java() + "<br>"
                + "<small>" + trapmap.shared.Version.LICENCE + "</small><br><br>"
                + "<b>trapmap</b> converts lifetime and PL maps of silicon wafers into equivalent densities of a chosen"
                + " recombination-active defect (Shockley–Read–Hall, after removing intrinsic and surface"
                + " recombination at each pixel's injection level).<br><br>"
                + "Statuses: OK converted; BELOW_LIMIT SRH share of 1/τ_eff under the detection resolution (the"
                + " density shown is the detection limit, an upper bound; left out of statistics and flags);"
                + " INVALID unusable input (or below 1 ns); NO_DATA outside the wafer.<br><br><b>Caution.</b> " + trapmap.maps.model.Caution.TEXT + "</body></html>";
    }
}
