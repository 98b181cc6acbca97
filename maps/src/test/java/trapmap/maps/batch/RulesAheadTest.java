package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Optional;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The rules read ahead ({@link Rules#prepare(Path)}, on a background thread while the command line is parsed) are
 * what the command's own reading of the same text under the same name returns; any other text or name is parsed
 * anew, and a file that fails leaves nothing behind.
 */
class RulesAheadTest {
    private static final String RULES = "{\"flag\": {\"quantity\": \"lifetime\", \"threshold\": 20},"
            + " \"edge_exclusion_mm\": 3,"
            + " \"iron\": {\"feb_state\": \"*-feb-state.*\", \"fei_state\": \"*-fe-i-state.*\","
            + " \"limits\": {\"iron_median_cm3\": {\"max\": 1e11}}}}";

    @Test
    void theSameTextAndNameGiveWhatWasReadAheadOthersAreParsedAnew(@TempDir Path dir) throws Exception {
        Path file = Files.writeString(dir.resolve("rules.json"), RULES);
        String name = file.toString();
        Rules.prepare(file);
        Rules first = Rules.parse(RULES, name);
        assertThat(Rules.parse(RULES, name)).isSameAs(first);
        Rules fresh = Rules.parse(RULES, name + "-other");
        assertThat(fresh).isNotSameAs(first).usingRecursiveComparison().isEqualTo(first);
        Optional<IronPairRules> iron = IronPairRules.parse(RULES, name);
        assertThat(IronPairRules.parse(RULES, name)).isSameAs(iron);
        assertThat(iron).isPresent();
        assertThat(IronPairRules.parse(RULES, name + "-other").orElseThrow()).usingRecursiveComparison()
                .isEqualTo(iron.orElseThrow());

        String wider = RULES.replace("\"edge_exclusion_mm\": 3", "\"edge_exclusion_mm\": 5");
        assertThat(Rules.parse(wider, name).edgeExclusionMm()).isEqualTo(5);
        assertThat(first.edgeExclusionMm()).isEqualTo(3);
        assertThatThrownBy(() -> Rules.parse("{\"limits\": [", name)).isInstanceOf(RulesException.class);
    }
}
