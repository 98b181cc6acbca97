package trapmap.shared;

/**
 * The program's version (printed by {@code trapmap --version} and shown in the viewer's About box), the Java runtime it
 * runs on, and the licence line. {@link #NUMBER} must agree with the Maven project version (a test reads the parent
 * {@code pom.xml}); it is a constant so that the command line's annotations can use it.
 */
public final class Version {
    /** Release number, the Maven project version without {@code -SNAPSHOT}. */
    public static final String NUMBER = "0.1.0";
    /** The version line: {@code trapmap 0.1.0}. */
    public static final String LINE = "trapmap " + NUMBER;
    /** Licences: trapmap's own (none granted yet) and those of the libraries shipped in its jar. */
    public static final String LICENCE = "Licence: no licence has been granted for trapmap itself yet (the project"
            + " carries no licence file). Bundled libraries: picocli, Jackson, Apache Commons CSV and Math, Apache"
            + " PDFBox and FlatLaf under the Apache License 2.0; TwelveMonkeys ImageIO under the BSD 3-Clause licence;"
            + " JFreeChart under the GNU LGPL 2.1.";

    private Version() {
    }

    /** The Java runtime, e.g. {@code Java 17.0.9 (OpenJDK 64-Bit Server VM, Eclipse Adoptium)}. */
    public static String java() {
        return "Java " + System.getProperty("java.version", "?") + " (" + System.getProperty("java.vm.name", "?")
                + ", " + System.getProperty("java.vendor", "?") + ")";
    }
}
