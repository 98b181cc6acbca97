package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.demo.DemoScenario;
import trapmap.maps.demo.HistoryScenario;
import trapmap.maps.demo.HistoryTruth;
import trapmap.maps.io.MapFiles;

class DemoCommandTest {
    @Test
    void writesTheSetAndListsIt(@TempDir Path dir) throws IOException {
        Path out = dir.resolve("demo");
        Cli.Run r = Cli.run("demo", "--out", out.toString());
        assertThat(r.err()).isEmpty();
        assertThat(r.code()).isZero();
        assertThat(r.out()).contains("truth.json").contains("README.md").contains("LOT-A01-W01.tif")
                .contains("injection-stack/LOT-S01-W01-dn1e15.tif")
                .contains("injection-stack/truth.json").contains("wrote 44 files");
        assertThat(Files.exists(out.resolve(DemoScenario.TRUTH))).isTrue();
        assertThat(MapFiles.readSingle(out.resolve("MON-200-W01.tif")).waferId()).isEqualTo("MON-200-W01");
        try (Stream<Path> s = Files.walk(out)) {
            assertThat(s.filter(p -> p.getFileName().toString().endsWith(".tmp")).count()).isZero();
        }
    }

    @Test
    void runningTwiceGivesByteIdenticalFiles(@TempDir Path dir) throws IOException {
        Path a = dir.resolve("a");
        Path b = dir.resolve("b");
        assertThat(Cli.run("demo", "--out", a.toString()).code()).isZero();
        assertThat(Cli.run("demo", "--out", b.toString()).code()).isZero();
        List<Path> files;
        try (Stream<Path> s = Files.walk(a)) {
            files = s.filter(Files::isRegularFile).sorted().toList();
        }
        assertThat(files).hasSize(44);
        for (Path p : files) {
            assertThat(Files.readAllBytes(b.resolve(a.relativize(p)))).isEqualTo(Files.readAllBytes(p));
        }
    }

    @Test
    void refusesANonEmptyFolderWithoutForce(@TempDir Path dir) throws IOException {
        Path keep = dir.resolve("notes.txt");
        Files.writeString(keep, "mine");
        Cli.Run r = Cli.run("demo", "--out", dir.toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).contains("--out").contains("not empty").contains("--force");
        try (Stream<Path> s = Files.list(dir)) {
            assertThat(s.count()).isEqualTo(1);
        }

        Cli.Run forced = Cli.run("demo", "--out", dir.toString(), "--force");
        assertThat(forced.code()).isZero();
        assertThat(Files.readString(keep)).isEqualTo("mine");
        assertThat(Files.exists(dir.resolve("README.md"))).isTrue();
    }

    @Test
    void refusesAFileAsOutput(@TempDir Path dir) throws IOException {
        Path file = dir.resolve("x.tif");
        Files.writeString(file, "x");
        Cli.Run r = Cli.run("demo", "--out", file.toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).contains("is a file");
    }

    @Test
    void missingOutIsAnInputError() {
        Cli.Run r = Cli.run("demo");
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).contains("--out");
    }

    @Test
    void historyWritesTheProductionHistoryAndSummarisesIt(@TempDir Path dir) throws IOException {
        Path out = dir.resolve("history");
        Cli.Run r = Cli.run("demo", "--history", out.toString());
        assertThat(r.err()).isEmpty();
        assertThat(r.code()).isZero();
        int wafers = HistoryScenario.DAYS * HistoryScenario.LOTS_PER_DAY * HistoryScenario.SLOTS.size();
        assertThat(r.out()).contains("truth.json").contains("rules-history.json").contains("README.md")
                .contains(wafers + " wafer maps").contains("wrote " + (2 * wafers + 3) + " files")
                .doesNotContain("L0001-S02.tif");
        HistoryTruth truth = HistoryScenario.readTruth(out.resolve(DemoScenario.TRUTH));
        assertThat(truth.driftTube()).isEqualTo(HistoryScenario.DRIFT_TUBE);
        assertThat(truth.badSlot()).isEqualTo(HistoryScenario.BAD_SLOT);
        assertThat(MapFiles.readSingle(out.resolve("L0001-S07.tif")).conditions().extra())
                .containsEntry("boat_slot", "7").containsEntry("lot", "L0001");
        assertThat(r.out().lines().count()).isLessThan(10);
    }

    @Test
    void historyRefusesANonEmptyFolderAndTheTwoTargetsTogether(@TempDir Path dir) throws IOException {
        Files.writeString(dir.resolve("notes.txt"), "mine");
        Cli.Run r = Cli.run("demo", "--history", dir.toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).contains("--history").contains("not empty").contains("--force");

        Cli.Run both = Cli.run("demo", "--out", dir.resolve("a").toString(), "--history",
                dir.resolve("b").toString());
        assertThat(both.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(both.err()).contains("--out").contains("--history");
        assertThat(Files.exists(dir.resolve("a"))).isFalse();

        Cli.Run none = Cli.run("demo", "--force");
        assertThat(none.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(none.errLines()).containsExactly("trapmap demo: --out or --history is required (--out: the folder"
                + " to write the demonstration set into; --history: the folder to write the invented production"
                + " history into)");
        assertThat(Files.exists(dir.resolve("b"))).isFalse();
    }
}
