package trapmap.cli;

/** Exit codes of the command line. */
final class Exit {
    /** Done. */
    static final int OK = 0;
    /** A cases file was processed but some of its rows failed. */
    static final int SOME_CASES_FAILED = 1;
    /** A batch inspection finished but some wafers failed their rules or could not be read. */
    static final int SOME_WAFERS_NOT_PASSED = 1;
    /** A trend was drawn and at least one run rule fires after its baseline. */
    static final int TREND_SIGNALS = 1;
    /** Invalid input: bad or missing flag values, unusable input files. Nothing was computed. */
    static final int INVALID_INPUT = 2;
    /** An unexpected internal error. */
    static final int INTERNAL_ERROR = 3;
    /**
     * A batch's output could not be written (disk full, no permission): the batch stopped; what was written stays
     * and {@code inspect --resume} continues from it.
     */
    static final int OUTPUT_NOT_WRITTEN = 4;
    /**
     * The results are complete but a report is missing: a picture or PDF step could not run because the Java runtime
     * lacks font libraries, fonts or a display; one line on stderr names what and the packages to install.
     */
    static final int REPORT_MISSING = 5;

    private Exit() {
    }
}
