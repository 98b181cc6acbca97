package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.Rules;
import trapmap.viewer.report.BatchReport;

/** {@code inspect} and its output folder: refused folders, --overwrite, --resume checks, output failures. */
class InspectRunTest {
    @TempDir
    Path dir;

    private static final String RULES = """
            {"edge_exclusion_mm": 1,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}},
             "grades": [{"grade": "A"}]}
            """;

    private Path inputs() throws IOException {
        Path in = Files.createDirectories(dir.resolve("in"));
        CrashTestMaps.write(in, 3, 7L);
        return in;
    }

    private Path rules(String name, String json) throws IOException {
        Path r = dir.resolve(name);
        Files.writeString(r, json);
        return r;
    }

    @Test
    void aNewRunIntoAFolderWithResultsExitsTwoAndOverwriteStartsClean() throws Exception {
        Path in = inputs();
        Path out = dir.resolve("out");
        String rules = rules("rules.json", RULES).toString();
        assertThat(Cli.run("inspect", in.toString(), "--rules", rules, "--out", out.toString()).code())
                .isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);
        Files.writeString(out.resolve("mine.txt"), "kept");
        Cli.Run again = Cli.run("inspect", in.toString(), "--rules", rules, "--out", out.toString());
        assertThat(again.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(again.errLines()).singleElement().asString().startsWith("trapmap inspect: " + out + " already holds")
                .contains("--overwrite");
        Cli.Run both = Cli.run("inspect", in.toString(), "--rules", rules, "--out", out.toString(), "--resume",
                "--overwrite");
        assertThat(both.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(both.err()).contains("--resume and --overwrite exclude each other");
        Cli.Run over = Cli.run("inspect", in.resolve("m00.tif").toString(), "--rules", rules, "--out",
                out.toString(), "--overwrite");
        assertThat(over.code()).isZero();
        assertThat(over.out()).contains("1 wafers: 1 pass");
        assertThat(Files.readAllLines(out.resolve("results.csv"))).hasSize(2);
        assertThat(out.resolve("thumbnails").resolve("m01.tif.png")).doesNotExist();
        assertThat(out.resolve("mine.txt")).hasContent("kept");
    }

    @Test
    void resumeWithOtherRulesExitsTwoNamingTheRulesHashes() throws Exception {
        Path in = inputs();
        Path out = dir.resolve("out");
        Path a = rules("a.json", RULES);
        Path b = rules("b.json", RULES.replace("\"threshold\": 10", "\"threshold\": 12"));
        Cli.run("inspect", in.toString(), "--rules", a.toString(), "--out", out.toString());
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", b.toString(), "--out", out.toString(), "--resume");
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        String ha = trapmap.maps.batch.RunManifest.sha256(Files.readAllBytes(a)).substring(0, 12);
        String hb = trapmap.maps.batch.RunManifest.sha256(Files.readAllBytes(b)).substring(0, 12);
        assertThat(r.errLines()).containsExactly("trapmap inspect: --resume: " + out + " was run with other rules (sha256 "
                + ha + "… then, " + hb + "… now); use a new --out or --overwrite");
    }

    @Test
    void anOutputThatCannotBeWrittenExitsFourNamingTheFolderAndResumeContinues() throws Exception {
        Path in = inputs();
        Path out = Files.createDirectories(dir.resolve("out"));
        Files.writeString(out.resolve("thumbnails"), "a file where the thumbnails folder goes");
        String rules = rules("rules.json", RULES).toString();
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules, "--out", out.toString());
        assertThat(r.code()).isEqualTo(Exit.OUTPUT_NOT_WRITTEN);
        assertThat(r.errLines()).singleElement().asString()
                .startsWith("trapmap inspect: --out " + out + ": output could not be written: " + out.resolve("thumbnails"))
                .contains("--resume continues").doesNotContain("internal error");
        assertThat(out.resolve("run.json")).content().contains("\"state\" : \"running\"");
        Files.delete(out.resolve("thumbnails"));
        Cli.Run resumed = Cli.run("inspect", in.toString(), "--rules", rules, "--out", out.toString(), "--resume");
        assertThat(resumed.code()).isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);
        assertThat(resumed.out()).contains("3 wafers: 2 pass, 1 fail, 0 error");
        assertThat(out.resolve("run.json")).content().contains("\"state\" : \"complete\"");
    }

    @Test
    void theSummaryRefusesAFolderWhoseRunIsUnfinishedOrMadeWithOtherPhysics() throws Exception {
        Path in = inputs();
        Path out = dir.resolve("out");
        Path rulesFile = rules("rules.json", RULES);
        Cli.run("inspect", in.toString(), "--rules", rulesFile.toString(), "--out", out.toString());
        Rules rules = Rules.read(rulesFile);
        assertThat(BatchReport.read(out, rules).rows()).hasSize(3);
        Path green = dir.resolve("green.json");
        Files.writeString(green, "{\"thermal_velocity\": \"green\"}");
        Rules other = rules.withPhysics(trapmap.maps.io.PhysicsSettingsFile.read(green));
        assertThatThrownBy(() -> BatchReport.read(out, other)).isInstanceOf(IOException.class)
                .hasMessageContaining(out + " was run with other physics settings");
        String record = Files.readString(out.resolve("run.json"));
        Files.writeString(out.resolve("run.json"), record.replace("\"complete\"", "\"running\""));
        assertThatThrownBy(() -> BatchReport.writeFor(out, rules)).isInstanceOf(IOException.class)
                .hasMessageContaining(out + " holds an unfinished run").hasMessageContaining("--resume");
        Files.delete(out.resolve("run.json"));
        assertThatThrownBy(() -> BatchReport.read(out, rules)).isInstanceOf(IOException.class)
                .hasMessageContaining(out + " has no run.json");
    }

    @Test
    void theHelpDocumentsTheExitCodeOfAnOutputFailure() {
        Cli.Run r = Cli.run("inspect", "--help");
        assertThat(r.out().replaceAll("\\s+", " ")).contains("4 output could not be written to DIR")
                .contains("--overwrite");
    }
}
