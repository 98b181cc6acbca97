package trapmap.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.lang.reflect.InvocationTargetException;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import trapmap.maps.demo.DemoScenario;

/**
 * Starts the desktop viewer without the command line touching Swing or AWT: the viewer class is looked up by name,
 * so that the headless commands never load the UI. Also finds (or writes) the bundled demonstration set.
 */
final class ViewerLaunch {
    /** The viewer's entry class. */
    static final String APP = "trapmap.viewer.ui.ViewerApp";
    /** Name of the demonstration folder beside the project root. */
    static final String DEMO_FOLDER = "demo-data";
    /** The example rules file of the demonstration set. */
    static final String RULES = "rules-example.json";

    private ViewerLaunch() {
    }

    /** True when the viewer can show a window here. */
    static boolean displayAvailable() {
        return (Boolean) call("displayAvailable", new Class<?>[0]);
    }

    /** Opens the viewer on {@code files} and returns when it is closed. */
    static void open(List<Path> files) {
        open(files, null);
    }

    /** Opens the viewer on {@code files}, judging them by the rules file {@code rules} (null: none). */
    static void open(List<Path> files, Path rules) {
        open(files, rules, null);
    }

    /** As {@link #open(List, Path)}, converting with the physics settings file {@code physics} (null: none). */
    static void open(List<Path> files, Path rules, Path physics) {
        call("open", new Class<?>[] {List.class, Path.class, Path.class}, files, rules, physics);
    }

    /** As {@link #open(List, Path, Path)}, with the history window open on the results store {@code store}. */
    static void open(List<Path> files, Path rules, Path physics, String store) {
        call("open", new Class<?>[] {List.class, Path.class, Path.class, String.class}, files, rules, physics, store);
    }

    private static Object call(String method, Class<?>[] types, Object... args) {
        try {
            return Class.forName(APP).getMethod(method, types).invoke(null, args);
        } catch (InvocationTargetException e) {
            Throwable t = e.getCause();
            if (t instanceof RuntimeException r) {
                throw r;
            }
            if (t instanceof Error err) {
                throw err;
            }
            if (t instanceof InterruptedException) {
                Thread.currentThread().interrupt();
                return null;
            }
            throw new IllegalStateException("the viewer failed: " + t, t);
        } catch (ReflectiveOperationException e) {
            throw new IllegalStateException("the viewer is missing from this build (" + e + ")", e);
        }
    }

    /**
     * The demonstration set: {@code demo-data/} in the project root of the running jar (or classes folder), else
     * in the current directory or one of its parents; when there is none, the set is generated into a temporary
     * folder together with the example rules.
     */
    static Path demoFolder(PrintWriter err) throws IOException {
        List<Path> starts = new ArrayList<>();
        try {
            Path code = Path.of(ViewerLaunch.class.getProtectionDomain().getCodeSource().getLocation().toURI());
            starts.add(code.toAbsolutePath());
        } catch (URISyntaxException | RuntimeException e) {
            // no code location: fall back to the current directory
        }
        starts.add(Path.of("").toAbsolutePath());
        for (Path start : starts) {
            for (Path p = start; p != null; p = p.getParent()) {
                Path demo = p.resolve(DEMO_FOLDER);
                if (Files.isRegularFile(demo.resolve(RULES))) {
                    return demo;
                }
            }
        }
        Path dir = Files.createTempDirectory("trapmap-demo-");
        DemoScenario.write(dir);
        Files.writeString(dir.resolve(RULES), exampleRules(), StandardCharsets.UTF_8);
        err.println("trapmap: no " + DEMO_FOLDER + "/ found; generated the demonstration set in " + dir);
        return dir;
    }

    /**
     * No display: runs {@code trapmap inspect} on the demonstration set with its example rules into a new temporary
     * folder, after one line saying why.
     */
    static int demoBatch(PrintWriter out, PrintWriter err) throws IOException {
        Path demo = demoFolder(err);
        Path report = Files.createTempDirectory("trapmap-report-");
        out.println("trapmap: no display available, so the viewer cannot open; running the demonstration batch"
                + " instead (trapmap inspect " + demo + " --rules " + demo.resolve(RULES) + " --out " + report + ")");
        out.flush();
        String[] args = {"inspect", demo.toString(), "--rules", demo.resolve(RULES).toString(), "--out",
            report.toString()};
        int code = TrapmapCommand.commandLine(out, err, args).execute(args);
        out.println(code == Exit.REPORT_MISSING ? "results: " + report + " (results.csv, results.json, regions.csv,"
                + " thumbnails, recurrence maps; no summary.pdf, see above)"
                : "report: " + report.resolve("summary.pdf") + " (and results.csv, results.json, regions.csv,"
                + " thumbnails, recurrence maps in " + report + ")");
        out.flush();
        return code == Exit.SOME_WAFERS_NOT_PASSED ? Exit.OK : code;
    }

    /** The example rules of the demonstration set, for a generated set: {@code demo-data/rules-example.json}. */
    static String exampleRules() throws IOException {
        try (var in = ViewerLaunch.class.getResourceAsStream("demo/" + RULES)) {
            if (in == null) {
                throw new IOException("the example rules are missing from this build (trapmap/cli/demo/" + RULES + ")");
            }
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        }
    }
}
