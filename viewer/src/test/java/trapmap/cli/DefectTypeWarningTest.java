package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A p-type library defect on an n-type map warns on every face of the command line and names the defects that suit
 * n-type material; a suitable defect converts without that warning.
 */
class DefectTypeWarningTest {
    private static final Path N_TYPE = Path.of("..", "demo-data", "LOT-N01-W01.tif");

    @TempDir
    Path dir;

    @Test
    void convertAndStatsWarnForFeIOnAnNTypeWafer() {
        Cli.Run convert = Cli.run("convert", N_TYPE.toString(), "--defect", "fe-b", "-o",
                dir.resolve("nt.tif").toString(), "--json");
        assertThat(convert.code()).as(convert.err()).isZero();
        assertThat(Cli.parse(convert.out()).get("warnings").toString()).contains("P_TYPE_DEFECT_ON_N_TYPE")
                .contains("cr-i, au-a, midgap");
        Cli.Run stats = Cli.run("stats", N_TYPE.toString(), "--defect", "fe-i", "--json");
        assertThat(stats.code()).isZero();
        assertThat(stats.err()).contains("warning: ").contains("P_TYPE_DEFECT_ON_N_TYPE").contains("midgap");
        Cli.Run midgap = Cli.run("stats", N_TYPE.toString(), "--defect", "midgap", "--json");
        assertThat(midgap.err()).doesNotContain("P_TYPE_DEFECT_ON_N_TYPE");
    }

    @Test
    void defectsListsTheTypeEachDefectSuits() {
        var json = Cli.json("defects", "--json");
        for (var d : json.get("defects")) {
            String id = d.get("id").asText();
            String types = d.get("suits_types").toString();
            switch (id) {
                case "fe-i", "fe-b", "cr-b" -> assertThat(types).as(id).isEqualTo("[\"p\"]");
                case "au-a" -> assertThat(types).as(id).isEqualTo("[\"n\"]");
                case "midgap", "cr-i" -> assertThat(types).as(id).isEqualTo("[\"n\",\"p\"]");
                default -> assertThat(types).as(id).isNotEqualTo("[]");
            }
            assertThat(d.get("suits_reason").asText()).as(id).isNotBlank();
        }
    }
}
