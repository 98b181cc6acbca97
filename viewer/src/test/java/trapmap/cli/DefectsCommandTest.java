package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;

class DefectsCommandTest {
    private static final List<String> IDS = List.of("fe-i", "fe-b", "cr-i", "cr-b", "ti-i", "mo-i", "au-a", "au-d",
            "ni-s", "midgap", "bo-lid");

    @Test
    void textListsAllElevenBuiltInDefects() {
        Cli.Run r = Cli.run("defects");
        assertThat(r.code()).isZero();
        assertThat(r.err()).isEmpty();
        List<String> headings = r.out().lines().filter(l -> !l.isBlank() && !l.startsWith(" "))
                .map(l -> l.split("\\s+")[0]).toList();
        assertThat(headings).containsExactlyElementsOf(IDS);
        assertThat(r.out()).contains("E_v + 0.38 eV").contains("1.3e-14 cm²").contains("spread note")
                .contains("fixed: 1.1e7 cm/s");
    }

    @Test
    void jsonListsParametersSpreadAndSource() {
        JsonNode j = Cli.json("defects", "--json");
        JsonNode list = j.get("defects");
        List<String> ids = new ArrayList<>();
        list.forEach(d -> ids.add(d.get("id").asText()));
        assertThat(ids).containsExactlyElementsOf(IDS).hasSize(DefectLibrary.all().size());
        JsonNode feI = list.get(0);
        Defect lib = DefectLibrary.byId("fe-i");
        assertThat(feI.get("level").asText()).isEqualTo("E_v + 0.38 eV");
        assertThat(feI.get("sigma_n_cm2").asDouble()).isEqualTo(1.3e-14);
        assertThat(feI.get("sigma_p_cm2").asDouble()).isEqualTo(7e-17);
        assertThat(feI.get("capture_ratio_k").asDouble()).isEqualTo(lib.captureRatio());
        assertThat(feI.get("vth_convention").asText()).isEqualTo("fixed");
        assertThat(feI.get("spread").get("energy_ev_max").asDouble()).isEqualTo(lib.spread().energyEv().max());
        assertThat(feI.get("spread").get("note").asText()).isEqualTo(lib.spread().note());
        assertThat(feI.get("source").asText()).isEqualTo(lib.source());
        JsonNode bo = list.get(10);
        assertThat(bo.get("density_supported").asBoolean()).isFalse();
        assertThat(bo.get("sigma_n_cm2").isNull()).isTrue();
        assertThat(bo.get("limitation").asText()).contains("normalised density").contains("trapmap calc bo");
    }

    @Test
    void userDefectsAreListedAfterTheBuiltIns(@TempDir Path dir) throws Exception {
        Path file = dir.resolve("user.json");
        Files.writeString(file, "[{\"id\": \"my-trap\", \"source\": \"own fit\", \"level\": {\"reference\": \"Ec\","
                + " \"energy_ev\": 0.3}, \"sigma_n_cm2\": 1e-15, \"sigma_p_cm2\": 1e-16}]");
        JsonNode list = Cli.json("defects", "--json", "--defect-file", file.toString()).get("defects");
        assertThat(list).hasSize(12);
        assertThat(list.get(11).get("id").asText()).isEqualTo("my-trap");
        assertThat(list.get(11).get("origin").asText()).isEqualTo(file.toString());
        Cli.Run text = Cli.run("defects", "--defect-file", file.toString());
        assertThat(text.out()).contains("my-trap").contains("E_c - 0.3 eV").contains("own fit");
    }
}
