package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import java.util.Optional;
import org.junit.jupiter.api.Test;

class IronPairRulesTest {
    private static final String BASE = "\"flag\": {\"quantity\": \"lifetime\", \"threshold\": 20}";

    private static Optional<IronPairRules> parse(String iron) throws RulesException {
        return IronPairRules.parse("{" + BASE + (iron == null ? "" : ", \"iron\": " + iron) + "}", "r.json");
    }

    @Test
    void readsGlobsAndLimits() throws Exception {
        IronPairRules r = parse("{\"feb_state\": \"*-feb-state.*\", \"fei_state\": \"*-fe-i-state.*\","
                + " \"limits\": {\"iron_median_cm3\": {\"max\": 1e11}, \"iron_p90_cm3\": {\"min\": 1e9, \"max\": 5e11}}}")
                .orElseThrow();
        assertThat(r.limits()).extracting(IronPairRules.IronLimit::figure).containsExactly("iron_median_cm3",
                "iron_p90_cm3");
        assertThat(r.limits().get(0).percent()).isEqualTo(50);
        assertThat(r.limits().get(1).percent()).isEqualTo(90);
        assertThat(r.limits().get(1).holds(1e10)).isTrue();
        assertThat(r.limits().get(1).holds(1e12)).isFalse();
        assertThat(r.limits().get(1).holds(Double.NaN)).isFalse();
        assertThat(parse(null)).isEmpty();
    }

    @Test
    void pairsNamesThroughTheWildcards() throws Exception {
        IronPairRules r = parse("{\"feb_state\": \"*-feb-state.*\", \"fei_state\": \"*-fe-i-state.*\"}")
                .orElseThrow();
        assertThat(r.feiNameFor("LOT-A03-W02-feb-state.tif")).contains("LOT-A03-W02-fe-i-state.tif");
        assertThat(r.febNameFor("LOT-A03-W02-fe-i-state.csv")).contains("LOT-A03-W02-feb-state.csv");
        assertThat(r.feiNameFor("LOT-A03-W02.tif")).isEmpty();
        assertThat(r.febNameFor("LOT-A03-W02-feb-state.tif")).isEmpty();
    }

    @Test
    void badSectionsNameTheFieldAndUnit() {
        assertThatThrownBy(() -> parse("{\"feb_state\": \"*-a.*\"}")).isInstanceOf(RulesException.class)
                .hasMessageContaining("field 'iron.fei_state'").hasMessageContaining("is required");
        assertThatThrownBy(() -> parse("{\"feb_state\": \"*-a.*\", \"fei_state\": \"b.tif\"}"))
                .hasMessageContaining("field 'iron.fei_state'").hasMessageContaining("needs a * or ?");
        assertThatThrownBy(() -> parse("{\"feb_state\": \"*-a.*\", \"fei_state\": \"*-b.tif\"}"))
                .hasMessageContaining("field 'iron.fei_state'").hasMessageContaining("same * and ? wildcards");
        assertThatThrownBy(() -> parse("{\"feb_state\": \"*-a.*\", \"fei_state\": \"*-b.*\", \"limits\":"
                + " {\"iron_median_cm3\": {\"max\": -1}}}")).hasMessageContaining("iron.limits.iron_median_cm3.max")
                .hasMessageContaining("(cm^-3)");
        assertThatThrownBy(() -> parse("{\"feb_state\": \"*-a.*\", \"fei_state\": \"*-b.*\", \"limits\":"
                + " {\"iron_mean_cm3\": {\"max\": 1}}}")).hasMessageContaining("unknown iron figure");
        assertThatThrownBy(() -> parse("{\"feb_state\": \"*-a.*\", \"fei_state\": \"*-b.*\", \"pairs\": 1}"))
                .hasMessageContaining("field 'iron.pairs'").hasMessageContaining("unknown key");
        assertThatThrownBy(() -> parse("{\"feb_state\": \"*-a.*\", \"fei_state\": \"*-b.*\", \"limits\":"
                + " {\"iron_p95_cm3\": {\"min\": 5, \"max\": 1}}}")).hasMessageContaining("above max");
    }

    @Test
    void theRulesFileAcceptsAndChecksTheIronSection() throws Exception {
        Rules.parse("{" + BASE + ", \"iron\": {\"feb_state\": \"*-a.*\", \"fei_state\": \"*-b.*\"}}", "r.json");
        assertThatThrownBy(() -> Rules.parse("{" + BASE + ", \"iron\": {\"feb_state\": \"*-a.*\"}}", "r.json"))
                .isInstanceOf(RulesException.class).hasMessageContaining("iron.fei_state");
        assertThat(IronPairRules.read(Path.of("..", "demo-data", "rules-example.json"))).isPresent();
    }

    @Test
    void theFigureColumnsNameTheirPercentile() {
        assertThat(IronPairRules.percentOf("iron_median_cm3")).isEqualTo(50);
        assertThat(IronPairRules.percentOf("iron_p95_cm3")).isEqualTo(95);
        assertThat(IronPairRules.percentOf("iron_p99.5_cm3")).isEqualTo(99.5);
        assertThat(IronPairRules.percentOf("iron_note")).isNaN();
        assertThat(IronPairRules.percentOf("iron_crossover_cm3")).isNaN();
    }
}
