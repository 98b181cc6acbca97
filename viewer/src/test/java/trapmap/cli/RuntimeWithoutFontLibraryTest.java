package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code inspect} and {@code convert} in a child JVM whose font library really does not load: a copy of this Java
 * runtime (linked, except the launcher, the VM and the font library) whose {@code libfontmanager.so} names a HarfBuzz
 * library that no system has, so that Java fails exactly as on a server without {@code libharfbuzz0b}
 * ({@code UnsatisfiedLinkError: …/libfontmanager.so: libharfbuzz.so.9: cannot open shared object file}). Runs where
 * the runtime is laid out so (a Linux JDK whose font library links the system's HarfBuzz, as Debian's and Ubuntu's
 * do); skipped elsewhere.
 */
@Tag("slow")
class RuntimeWithoutFontLibraryTest {
    private static final Path DEMO = Path.of("..", "demo-data").toAbsolutePath().normalize();
    private static final List<String> WAFERS = List.of("LOT-A01-W01", "LOT-A01-W02", "LOT-A01-W03", "MON-200-W01");
    private static final List<String> RESULTS = List.of("results.csv", "results.json", "regions.csv",
            "footprints.csv", "recurrence.csv");

    @TempDir
    Path dir;

    @Test
    void theBatchEndsWithCompleteResultsOneLineAndExitFive() throws Exception {
        Path java = brokenRuntime(dir.resolve("jre"));
        assumeTrue(java != null, "this Java runtime's font library does not link libharfbuzz.so.0");
        Path in = Files.createDirectories(dir.resolve("in"));
        for (String w : WAFERS) {
            Files.copy(DEMO.resolve(w + ".tif"), in.resolve(w + ".tif"));
            Files.copy(DEMO.resolve(w + ".json"), in.resolve(w + ".json"));
        }
        String rules = DEMO.resolve("rules-example.json").toString();
        Path normal = dir.resolve("normal");
        assertThat(Cli.run("inspect", in.toString(), "--rules", rules, "--out", normal.toString()).code())
                .isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);

        Path out = dir.resolve("out");
        Child r = run(java, "inspect", in.toString(), "--rules", rules, "--out", out.toString(), "--threads", "2");
        System.out.println("exit " + r.code + "; last lines:\n" + String.join("\n", r.last(2)));

        assertThat(r.code).isEqualTo(Exit.REPORT_MISSING);
        List<String> messages = r.err.stream().filter(l -> !l.startsWith("inspect: ")).toList();
        assertThat(messages).hasSize(1);
        assertThat(messages.get(0)).startsWith("trapmap inspect: the recurrence pictures and summary.pdf were not made:"
                + " this Java runtime cannot draw text (UnsatisfiedLinkError: " + dir.resolve("jre").resolve("lib")
                + "/libfontmanager.so: libharfbuzz.so.9: cannot open shared object file")
                .contains("apt-get install libharfbuzz0b libfreetype6 libfontconfig1 fontconfig fonts-dejavu-core")
                .endsWith("the results are complete (once that is installed, --resume writes the missing files)");
        assertThat(r.out).hasSize(1);
        assertThat(r.out.get(0)).startsWith("4 wafers: ").endsWith("; summary PDF missing (see the line above)");
        assertThat(String.join("\n", r.err)).doesNotContain("\tat ").doesNotContain("Exception in thread");
        for (String f : RESULTS) {
            assertThat(Files.readString(out.resolve(f))).as(f).isEqualTo(Files.readString(normal.resolve(f)));
        }
        assertThat(out.resolve("summary.pdf")).doesNotExist();
        assertThat(Files.list(out.resolve("thumbnails")).count()).as("thumbnails need no fonts").isEqualTo(4);

        Path png = dir.resolve("w1.png");
        Child c = run(java, "convert", in.resolve("LOT-A01-W01.tif").toString(), "--defect", "fe-i", "-o",
                png.toString());
        assertThat(c.code).isEqualTo(Exit.REPORT_MISSING);
        assertThat(c.err).hasSize(1);
        assertThat(c.err.get(0)).startsWith("trapmap convert: " + png + " was not made: this Java runtime cannot draw"
                + " text (UnsatisfiedLinkError: ");
        assertThat(png).doesNotExist();
    }

    private record Child(int code, List<String> out, List<String> err) {
        List<String> last(int n) {
            List<String> all = new ArrayList<>(err.stream().filter(l -> !l.startsWith("inspect: ")).toList());
            all.addAll(out);
            return all.subList(Math.max(0, all.size() - n), all.size());
        }
    }

    private Child run(Path java, String... args) throws Exception {
        List<String> cmd = new ArrayList<>(List.of(java.toString(), "-Xmx512m", "-cp",
                System.getProperty("java.class.path"), TrapmapCommand.class.getName()));
        cmd.addAll(List.of(args));
        Path out = Files.createTempFile(dir, "out", ".txt");
        Path err = Files.createTempFile(dir, "err", ".txt");
        Process p = new ProcessBuilder(cmd).redirectOutput(out.toFile()).redirectError(err.toFile()).start();
        assertThat(p.waitFor(120, TimeUnit.SECONDS)).as("child finished").isTrue();
        return new Child(p.exitValue(), Files.readAllLines(out), Files.readAllLines(err));
    }

    /**
     * A copy of this Java runtime in {@code jre} whose font library needs {@code libharfbuzz.so.9}, or null when this
     * runtime has no {@code lib/libfontmanager.so} naming {@code libharfbuzz.so.0} once. The launcher, its
     * {@code libjli.so} and the VM are copied (each finds the runtime's home from its own real path), everything else
     * is linked.
     */
    static Path brokenRuntime(Path jre) throws IOException {
        Path home = Path.of(System.getProperty("java.home")).toRealPath();
        Path lib = home.resolve("lib");
        Path fontManager = lib.resolve("libfontmanager.so");
        if (!System.getProperty("os.name").equals("Linux") || !Files.isRegularFile(fontManager)
                || !Files.isRegularFile(lib.resolve("server/libjvm.so")) || !Files.isRegularFile(lib.resolve("libjli.so"))
                || !Files.isRegularFile(home.resolve("bin/java"))) {
            return null;
        }
        byte[] bytes = Files.readAllBytes(fontManager);
        byte[] needed = "libharfbuzz.so.0\0".getBytes(StandardCharsets.US_ASCII);
        int at = indexOf(bytes, needed, 0);
        if (at < 0 || indexOf(bytes, needed, at + 1) >= 0) {
            return null;
        }
        bytes[at + needed.length - 2] = '9';
        Files.createDirectories(jre.resolve("bin"));
        Files.copy(home.resolve("bin/java"), jre.resolve("bin/java"), StandardCopyOption.COPY_ATTRIBUTES);
        linkAllBut(home, jre, List.of("bin", "lib"));
        linkAllBut(lib, jre.resolve("lib"), List.of("server", "libjli.so", "libfontmanager.so"));
        linkAllBut(lib.resolve("server"), jre.resolve("lib/server"), List.of("libjvm.so"));
        Files.copy(lib.resolve("libjli.so"), jre.resolve("lib/libjli.so"));
        Files.copy(lib.resolve("server/libjvm.so"), jre.resolve("lib/server/libjvm.so"));
        Files.write(jre.resolve("lib/libfontmanager.so"), bytes);
        return jre.resolve("bin/java");
    }

    private static void linkAllBut(Path from, Path to, List<String> except) throws IOException {
        Files.createDirectories(to);
        try (Stream<Path> s = Files.list(from)) {
            for (Path e : s.toList()) {
                if (!except.contains(e.getFileName().toString()) && Files.exists(e)) { // not a dangling link
                    Files.createSymbolicLink(to.resolve(e.getFileName().toString()), e.toRealPath());
                }
            }
        }
    }

    private static int indexOf(byte[] haystack, byte[] needle, int from) {
        outer:
        for (int i = from; i <= haystack.length - needle.length; i++) {
            for (int j = 0; j < needle.length; j++) {
                if (haystack[i + j] != needle[j]) {
                    continue outer;
                }
            }
            return i;
        }
        return -1;
    }
}
