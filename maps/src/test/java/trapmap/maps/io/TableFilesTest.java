package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class TableFilesTest {
    @TempDir
    Path dir;

    @Test
    void writesQuotedCsvAndLeavesNoTemporaryFile() throws Exception {
        Path f = dir.resolve("sub/stats.csv");
        TableFiles.writeCsv(f, List.of("figure", "value", "unit"),
                List.of(List.of("median, before", 12.5, "µs"), List.of("count", 3, "px")));
        assertThat(Files.readString(f, StandardCharsets.UTF_8))
                .isEqualTo("figure,value,unit\n\"median, before\",12.5,µs\ncount,3,px\n");
        try (var files = Files.list(f.getParent())) {
            assertThat(files).containsExactly(f);
        }
    }

    @Test
    void aRowOfTheWrongWidthIsRefusedAndTheOldFileKept() throws Exception {
        Path f = dir.resolve("t.csv");
        Files.writeString(f, "old\n");
        assertThatThrownBy(() -> TableFiles.writeCsv(f, List.of("a", "b"), List.of(List.of("x"))))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("1 cells");
        assertThat(Files.readString(f)).isEqualTo("old\n");
    }
}
