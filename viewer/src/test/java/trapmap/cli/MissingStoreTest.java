package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The commands that read a results store refuse a SQLite file that does not exist and make none there. */
class MissingStoreTest {
    @TempDir
    Path dir;

    @Test
    void trendRefusesAMissingStoreAndMakesNoFile() {
        Path store = dir.resolve("typo.sqlite");
        Cli.Run r = Cli.run("trend", "--store", store.toString(), "--figure", "trap_density_p95_cm3", "-o",
                dir.resolve("t.csv").toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).containsExactly("trapmap trend: --store " + store.toAbsolutePath().normalize()
                + " does not exist; give a SQLite file made by 'trapmap inspect --store' or"
                + " postgresql://host[:port]/database");
        assertThat(store).doesNotExist();
        assertThat(dir.resolve("t.csv")).doesNotExist();
    }

    @Test
    void recurrenceRefusesAMissingStoreAndMakesNoFile() {
        Path store = dir.resolve("typo.sqlite");
        Cli.Run r = Cli.run("recurrence", "--store", "sqlite:" + store, "-o", dir.resolve("maps").toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).hasSize(1).first().asString().startsWith("trapmap recurrence: --store "
                + store.toAbsolutePath().normalize() + " does not exist");
        assertThat(store).doesNotExist();
    }

    @Test
    void aFileThatIsNoStoreIsNamedOnceInOneShortLine() throws Exception {
        Path notAStore = dir.resolve("results.csv");
        java.nio.file.Files.writeString(notAStore, "file,wafer_id\nw.tif,W1\n".repeat(200));
        for (String command : new String[] {"trend", "recurrence"}) {
            Cli.Run r = command.equals("trend")
                    ? Cli.run("trend", "--store", notAStore.toString(), "--figure", "trap_density_p95_cm3", "-o",
                    dir.resolve("t.csv").toString())
                    : Cli.run("recurrence", "--store", notAStore.toString(), "-o", dir.resolve("maps").toString());
            assertThat(r.code()).as(command).isEqualTo(Exit.INVALID_INPUT);
            assertThat(r.errLines()).as(command).hasSize(1);
            assertThat(r.err()).as(command).startsWith("trapmap " + command + ": --store " + notAStore + ": ")
                    .doesNotContain("--store store").doesNotContain("-----").doesNotContain("Error Code");
        }
    }

    @Test
    void theDriversAppendedBlockIsLeftOut() {
        assertThat(Flags.storeProblem("store a.db: cannot be opened or its schema made: Unable to obtain connection"
                + " from database: [SQLITE_NOTADB] not a database\n-------\nSQL State  : null\nError Code : 26"))
                .isEqualTo("a.db: cannot be opened or its schema made: Unable to obtain connection from database:"
                        + " [SQLITE_NOTADB] not a database");
        assertThat(Flags.storeProblem("holds no wafer")).isEqualTo("holds no wafer");
    }

    @Test
    void inspectNamesAStoreThatCannotBeOpenedInOneShortLine() throws Exception {
        Path notAStore = dir.resolve("results.csv");
        java.nio.file.Files.writeString(notAStore, "file,wafer_id\nw.tif,W1\n".repeat(200));
        Cli.Run r = Cli.run("inspect", Path.of("..", "demo-data", "LOT-A01-W01.tif").toString(), "--rules",
                Path.of("..", "demo-data", "rules-example.json").toString(), "--out", dir.resolve("out").toString(),
                "--no-pdf", "--no-thumbnails", "--store", notAStore.toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).startsWith("trapmap inspect: --store " + notAStore + ": cannot be opened")
                .doesNotContain("-----").doesNotContain("Error Code");
    }
}
