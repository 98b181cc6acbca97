package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Optional;
import java.util.stream.Stream;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.Rendering;

/**
 * {@code inspect} and {@code report} on a Java runtime that cannot draw text (its font library did not load): the
 * results are those of a normal run, the pictures and PDFs that need text are left out with one line naming what is
 * missing and the packages to install, and the exit code is {@link Exit#REPORT_MISSING}. Also {@code --no-pdf} and
 * {@code --no-thumbnails}, which leave them out on purpose.
 */
class InspectWithoutFontsTest {
    /** What Java 17 on Debian says when libfontmanager's HarfBuzz library is not installed. */
    static final String HARFBUZZ_MISSING = "/usr/lib/jvm/java-17-openjdk-amd64/lib/libfontmanager.so: libharfbuzz.so.0:"
            + " cannot open shared object file: No such file or directory";
    private static final String RULES = """
            {"edge_exclusion_mm": 1,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}}}
            """;
    /** The outputs that are results, compared byte for byte with a normal run's. */
    private static final List<String> RESULTS = List.of("results.csv", "results.json", "regions.csv",
            "footprints.csv", "recurrence.csv");

    @TempDir
    Path dir;
    private Path in;
    private Path rules;

    @BeforeEach
    void maps() throws Exception {
        in = Files.createDirectories(dir.resolve("in"));
        wafer("w1", false);
        wafer("w2", true);
        wafer("w3", true);
        rules = dir.resolve("rules.json");
        Files.writeString(rules, RULES);
    }

    @AfterEach
    void realRuntime() {
        Pictures.runtime = Pictures.RUNTIME;
        InspectCommand.summaryWriter = null;
    }

    /** An 80 mm round wafer of 80 µs, with or without a 4 µs spot ({@link InspectCommandTest#wafer}). */
    private void wafer(String name, boolean spot) throws Exception {
        InspectCommandTest.wafer(in, name, spot);
    }

    private Cli.Run inspect(Path out, String... more) {
        List<String> args = new java.util.ArrayList<>(List.of("inspect", in.toString(), "--rules", rules.toString(),
                "--out", out.toString(), "--threads", "2"));
        args.addAll(List.of(more));
        return Cli.run(args.toArray(String[]::new));
    }

    /** The stderr lines that are not progress lines. */
    private static List<String> messages(Cli.Run r) {
        return r.errLines().stream().filter(l -> !l.startsWith("inspect: ")).toList();
    }

    private static List<String> pngs(Path out) throws Exception {
        try (Stream<Path> s = Files.list(out)) {
            return s.map(p -> p.getFileName().toString()).filter(n -> n.endsWith(".png")).sorted().toList();
        }
    }

    private static void assertSameResults(Path expected, Path actual) throws Exception {
        for (String f : RESULTS) {
            assertThat(Files.readString(actual.resolve(f))).as(f).isEqualTo(Files.readString(expected.resolve(f)));
        }
    }

    /** As {@link #assertSameResults}, for a resumed run: its results.json counts the kept wafers as skipped. */
    private static void assertSameResumedResults(Path expected, Path actual) throws Exception {
        for (String f : RESULTS) {
            String e = Files.readString(expected.resolve(f));
            String a = Files.readString(actual.resolve(f));
            if (f.equals("results.json")) {
                e = e.replaceFirst("\"skipped\" : \\d+", "\"skipped\" : 3");
                assertThat(a).as(f).contains("\"skipped\" : 3");
            }
            assertThat(a).as(f).isEqualTo(e);
        }
    }

    private static String runJson(Path out) throws Exception {
        return Files.readString(out.resolve("run.json"));
    }

    /** The runtime's probe fails as the font library fails to load. */
    private static void fontLibraryMissing() {
        Pictures.runtime = () -> Rendering.probe(() -> { }, () -> {
            throw new UnsatisfiedLinkError(HARFBUZZ_MISSING);
        });
    }

    @Test
    void withoutTheFontLibraryTheResultsAreCompleteAndOneLineNamesThePackages() throws Exception {
        Path normal = dir.resolve("normal");
        Cli.Run ok = inspect(normal);
        assertThat(ok.code()).isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);
        assertThat(normal.resolve("summary.pdf")).exists();
        assertThat(pngs(normal)).isNotEmpty();

        fontLibraryMissing();
        Path out = dir.resolve("nofonts");
        Cli.Run r = inspect(out);

        assertThat(r.code()).isEqualTo(Exit.REPORT_MISSING).isEqualTo(5);
        assertThat(messages(r)).containsExactly("trapmap inspect: the recurrence pictures and summary.pdf were not"
                + " made: this Java runtime cannot draw text (UnsatisfiedLinkError: " + HARFBUZZ_MISSING + ");"
                + " install the font libraries and a font (Debian/Ubuntu: apt-get install libharfbuzz0b libfreetype6"
                + " libfontconfig1 fontconfig fonts-dejavu-core; other systems: the packages holding libharfbuzz.so.0);"
                + " the results are complete (once that is installed, --resume writes the missing files)");
        assertThat(r.out().strip()).isEqualTo("3 wafers: 1 pass, 2 fail, 0 error; yield 33.3 %; results in "
                + out.resolve("results.csv") + " and " + out.resolve("results.json")
                + "; summary PDF missing (see the line above)");
        assertSameResults(normal, out);
        assertThat(out.resolve("summary.pdf")).doesNotExist();
        assertThat(pngs(out)).isEmpty();
        assertThat(out.resolve("recurrence.csv")).exists();
        assertThat(runJson(out)).contains("\"state\" : \"complete\"")
                .contains("\"summary_pdf\" : \"missing: this Java runtime cannot draw text (UnsatisfiedLinkError");

        // once the runtime draws again, --resume writes what was missing and changes no result
        Pictures.runtime = Pictures.RUNTIME;
        Cli.Run resumed = inspect(out, "--resume");
        assertThat(resumed.code()).isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);
        assertThat(messages(resumed)).isEmpty();
        assertThat(out.resolve("summary.pdf")).exists();
        assertThat(pngs(out)).isEqualTo(pngs(normal));
        assertSameResumedResults(normal, out);
        assertThat(runJson(out)).contains("\"summary_pdf\" : \"written\"");
    }

    @Test
    void aSummaryStepFailingAtItsBoundaryIsSkippedTheSameWay() throws Exception {
        Path out = dir.resolve("out");
        assertThat(inspect(out).code()).isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);
        Path reference = dir.resolve("reference");
        Files.createDirectories(reference);
        for (String f : RESULTS) {
            Files.copy(out.resolve(f), reference.resolve(f));
        }
        assertThat(out.resolve("summary.pdf")).exists();

        // the probe passes, the PDF step itself fails as BatchReport.write did on a server without HarfBuzz
        InspectCommand.summaryWriter = (d, rules, recurrence) -> {
            throw new UnsatisfiedLinkError(HARFBUZZ_MISSING);
        };
        Cli.Run r = inspect(out, "--resume", "--json");

        assertThat(r.code()).isEqualTo(Exit.REPORT_MISSING);
        assertThat(messages(r)).hasSize(1);
        assertThat(messages(r).get(0)).startsWith("trapmap inspect: summary.pdf was not made: this Java runtime"
                + " cannot draw text (UnsatisfiedLinkError: " + HARFBUZZ_MISSING + "); install the font libraries");
        var json = Cli.parse(r.out());
        assertThat(json.has("summary_pdf")).isFalse();
        assertThat(json.get("not_made").asText()).startsWith("summary.pdf was not made");
        assertThat(json.get("fail").asInt()).isEqualTo(2);
        assertSameResumedResults(reference, out);
        assertThat(out.resolve("summary.pdf")).as("the earlier run's summary, which no longer matches").doesNotExist();
        assertThat(pngs(out)).isNotEmpty();
    }

    @Test
    void noPdfAndNoThumbnailsLeaveThemOutOnPurposeWithTheSameResults() throws Exception {
        Path normal = dir.resolve("normal");
        assertThat(inspect(normal).code()).isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);
        assertThat(normal.resolve("thumbnails")).isDirectory();

        Path out = dir.resolve("lean");
        Cli.Run r = inspect(out, "--no-pdf", "--no-thumbnails");
        assertThat(r.code()).isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);
        assertThat(messages(r)).isEmpty();
        assertThat(r.out()).contains("; no summary PDF (--no-pdf)");
        assertSameResults(normal, out);
        assertThat(out.resolve("summary.pdf")).doesNotExist();
        assertThat(out.resolve("thumbnails")).doesNotExist();
        assertThat(runJson(out)).contains("\"thumbnails\" : false").contains("\"summary_pdf\" : \"off (--no-pdf)\"");

        // --resume continues such a run (the PDF may be asked for now; thumbnails must stay as they were)
        Cli.Run resumed = inspect(out, "--resume", "--no-thumbnails");
        assertThat(resumed.code()).isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);
        assertThat(resumed.out()).contains("(3 kept from the previous run)").contains("; summary ");
        assertThat(out.resolve("summary.pdf")).exists();
        assertSameResumedResults(normal, out);
        assertThat(inspect(out, "--resume").code()).as("thumbnails on now, off then").isEqualTo(Exit.INVALID_INPUT);
    }

    @Test
    void reportPrintsTheVerdictAndOneLineWhenThePageCannotBeDrawn() throws Exception {
        fontLibraryMissing();
        Path demo = Path.of("..", "demo-data").toAbsolutePath().normalize();
        Path pdf = dir.resolve("w2.pdf");
        Cli.Run r = Cli.run("report", demo.resolve("LOT-A01-W01.tif").toString(), "--rules",
                demo.resolve("rules-example.json").toString(), "-o", pdf.toString());
        assertThat(r.code()).isEqualTo(Exit.REPORT_MISSING);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.errLines().get(0)).startsWith("trapmap report: w2.pdf was not made: this Java runtime cannot"
                + " draw text (UnsatisfiedLinkError: " + HARFBUZZ_MISSING + "); install the font libraries");
        assertThat(r.out()).startsWith("LOT-A01-W01.tif: pass").contains("no report (see the line above)");
        assertThat(pdf).doesNotExist();
        Optional<Rendering.Missing> real = Pictures.RUNTIME.get();
        assertThat(real).as("this machine draws text, so the test above was the probe's doing").isEmpty();
    }
}
