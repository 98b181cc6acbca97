package trapmap.maps.model;

/**
 * The caution that goes with every equivalent trap density: on the command line, in the viewer, in the PDF reports
 * and in the README (a test checks that the README quotes it).
 */
public final class Caution {
    /** The one text, a full sentence. */
    public static final String TEXT = "Equivalent density assumes one dominant defect; verify with an independent"
            + " method before scrapping material; follow site procedures.";

    private Caution() {
    }
}
