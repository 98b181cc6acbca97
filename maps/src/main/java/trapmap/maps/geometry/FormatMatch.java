package trapmap.maps.geometry;

import java.util.List;

/**
 * The standard format nearest to a measured or fitted outline, judged at the pixel pitch of the map it came from.
 *
 * @param format          the matching format; null when the outline's size matches round formats but its mark
 *                        (flat or notch) does not tell which ({@link #mark()} says why)
 * @param family          the format id, or for such a round outline the size family, e.g. {@code round-200}
 * @param candidates      the formats of the nearest nominal size (one for a square outline; a round one may have
 *                        several, one per mark)
 * @param deviationMm     largest deviation of a compared dimension (diameter; or side and diagonal), mm
 * @param toleranceMm     the allowed deviation at this pitch: the format's size tolerance (its larger side) widened
 *                        by {@link WaferFormat#PITCH_TOLERANCE_FACTOR} × pitch, mm
 * @param withinTolerance true when every compared dimension lies inside the pitch-widened tolerance
 * @param mark            how the orientation mark was judged
 * @param pitchMm         pixel pitch of the map the outline was fitted to, mm (0: an exact outline)
 */
public record FormatMatch(WaferFormat format, String family, List<WaferFormat> candidates, double deviationMm,
                          double toleranceMm, boolean withinTolerance, Mark mark, double pitchMm) {

    /** Family of a wafer whose outline is fitted but matches no format within tolerance. */
    public static final String FITTED = "fitted";

    /** How the flat or notch of a round outline was judged. */
    public enum Mark {
        /** The format has no mark (square formats). */
        NONE,
        /** The fitted outline has the mark of exactly one candidate format. */
        RESOLVED,
        /** A candidate's mark is too small for the pixel pitch, so the formats of this size cannot be told apart. */
        NOT_RESOLVED,
        /** The pitch would show every candidate's mark, but the fitted outline has none of them. */
        NOT_FOUND;

        /** Short text for reports: {@code none}, {@code resolved}, {@code not-resolved}, {@code not-found}. */
        public String key() {
            return name().toLowerCase(java.util.Locale.ROOT).replace('_', '-');
        }
    }

    public FormatMatch {
        candidates = List.copyOf(candidates);
    }

    /** True when the fiducial was seen and matches the format (always true for formats without one). */
    public boolean markResolved() {
        return mark == Mark.NONE || mark == Mark.RESOLVED;
    }

    /**
     * The family a batch files the wafer under (rules {@code wafer} matches, recurrence maps): {@link #family()}
     * when the size is within tolerance, otherwise {@value #FITTED}.
     */
    public String batchFamily() {
        return withinTolerance ? family : FITTED;
    }

    /**
     * One line for people, e.g. {@code round-200: size 0.02 mm off nominal, within ±1.00 mm; mark not resolved at
     * 0.8 mm pitch}.
     */
    public String describe() {
        String size = String.format(java.util.Locale.ROOT, "size %.2f mm off nominal, %s ±%.2f mm", deviationMm,
                withinTolerance ? "within" : "outside", toleranceMm);
        String m = switch (mark) {
            case NONE -> "";
            case RESOLVED -> "; mark resolved";
            case NOT_RESOLVED -> String.format(java.util.Locale.ROOT, "; mark not resolved at %s mm pitch",
                    trim(pitchMm));
            case NOT_FOUND -> "; mark not found";
        };
        return family + ": " + size + m;
    }

    private static String trim(double v) {
        return v == Math.rint(v) ? Long.toString((long) v) : Double.toString(v);
    }
}
