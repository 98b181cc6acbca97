package trapmap.cli;

import java.io.IOException;
import java.io.InputStream;
import java.io.PrintStream;
import java.util.Locale;

/**
 * {@code trapmap --help} and {@code trapmap --version} without picocli: the texts picocli prints for them, taken from
 * the resource {@value #ROOT_HELP} (the root help as picocli renders it without a terminal: 80 columns, no colours)
 * and {@link TrapmapCommand#VERSION}, printed by {@link TrapmapCommand#main} before any command line is built. Building
 * picocli's model and rendering the usage is most of the time of such a run after the Java virtual machine's own
 * start. {@code QuickHelpTest} compares the resource byte for byte with picocli's rendering; {@code
 * -Dtrapmap.writeRootHelp=true} on that test writes it anew.
 *
 * <p>Only where picocli would print exactly these bytes: one argument ({@code -h}, {@code --help}, {@code -V} or
 * {@code --version}); no terminal (picocli 4.7 asks a terminal for its width and, there, prints colours); no
 * {@code picocli.*} system property (they change colours, width or tracing); no {@code CLICOLOR_FORCE} (forces
 * colours); not on Windows (whose consoles picocli probes otherwise); lines ending in {@code \n}. Every other request,
 * and every command's help, goes through picocli.
 */
final class QuickHelp {
    /** The root help's resource, next to this class. */
    static final String ROOT_HELP = "root-help.txt";

    private QuickHelp() {
    }

    /**
     * Prints the answer to {@code args} on {@code out} (UTF-8) and returns true when {@code args} is a root help or
     * version request that picocli would answer with the stored text; else prints nothing and returns false.
     */
    static boolean print(String[] args, PrintStream out) {
        if (args.length != 1) {
            return false;
        }
        boolean help = args[0].equals("--help") || args[0].equals("-h");
        boolean version = args[0].equals("--version") || args[0].equals("-V");
        if (!(help || version) || !plainOutput()) {
            return false;
        }
        byte[] text;
        if (help) {
            try (InputStream in = QuickHelp.class.getResourceAsStream(ROOT_HELP)) {
                if (in == null) {
                    return false;
                }
                text = in.readAllBytes();
            } catch (IOException e) {
                return false; // picocli renders it
            }
        } else {
            text = (TrapmapCommand.VERSION + "\n").getBytes(java.nio.charset.StandardCharsets.UTF_8);
        }
        out.write(text, 0, text.length);
        out.flush();
        return true;
    }

    /** True when picocli would render the root help without colours, 80 columns wide, lines ending in {@code \n}. */
    static boolean plainOutput() {
        if (System.console() != null || !"\n".equals(System.lineSeparator())) {
            return false;
        }
        String os = System.getProperty("os.name", "");
        if (os.toLowerCase(Locale.ROOT).startsWith("win")) {
            return false;
        }
        String force = System.getenv("CLICOLOR_FORCE");
        if (force != null && !force.equals("0")) {
            return false;
        }
        for (String name : System.getProperties().stringPropertyNames()) {
            if (name.startsWith("picocli.")) {
                return false;
            }
        }
        return true;
    }
}
