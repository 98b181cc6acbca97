package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.shared.progress.ProgressListener;

/** The batch tells each wafer it writes ({@link BatchInspection#tellingWafers}); the rules' lot pattern. */
class WaferListenerTest {
    @TempDir
    Path dir;

    private static final String RULES = """
            {"edge_exclusion_mm": 2,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}},
             "lot_pattern": "^(LOT-[A-Z0-9]+)-W"}
            """;

    private List<Path> maps() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        SyntheticWafers.clean(in, "w1", 80);
        SyntheticWafers.spot(in, "w2", 80, 20, -10, 5, 4);
        SyntheticWafers.clean(in, "w3", 40);
        try (var s = Files.list(in)) {
            return s.filter(p -> !p.toString().endsWith(".json")).sorted().toList();
        }
    }

    @Test
    void eachWrittenWaferIsToldInTableOrderWithItsRegionsAndTheKeptOnesAreNot() throws Exception {
        List<Path> files = maps();
        Rules rules = Rules.parse(RULES, "rules.json");
        List<WaferResult> told = new ArrayList<>();
        List<String> rowIds = new ArrayList<>();
        Path out = dir.resolve("out");
        // stopped after two wafers, as an interrupted program would be
        BatchInspectionTest.interruptedAfter(new BatchInspection(rules).tellingWafers((r, row) -> {
            told.add(r);
            rowIds.add(row.get("wafer_id"));
        }), files, out, 2);
        assertThat(told).extracting(WaferResult::waferId).containsExactly("w1", "w2");
        assertThat(rowIds).containsExactly("w1", "w2");
        assertThat(told.get(1).status()).isEqualTo(WaferResult.Status.FAIL);
        assertThat(told.get(1).regions()).isNotEmpty();
        assertThat(told.get(1).footprint()).isNotNull();
        assertThat(BatchInspection.regionRows(told.get(1))).hasSize(told.get(1).regions().size());
        int spotRegions = told.get(1).regions().size();

        told.clear();
        BatchInspection.Summary s = new BatchInspection(rules).tellingWafers((r, row) -> told.add(r)).run(files, out,
                new BatchInspection.Options(1, true, false, ProgressListener.NONE));
        assertThat(told).extracting(WaferResult::waferId).containsExactly("w3");
        assertThat(s.total()).isEqualTo(3);
        assertThat(s.skipped()).isEqualTo(2);
        assertThat(told.get(0).regions()).isEmpty();
        assertThat(Files.readAllLines(out.resolve(BatchInspection.REGIONS_NAME))).hasSize(1 + spotRegions);
    }

    @Test
    void theLotIsTheFirstGroupOfTheRulesPatternInTheWaferId() throws Exception {
        Pattern p = LotPattern.parse(RULES, "rules.json").orElseThrow();
        assertThat(LotPattern.lotOf(p, "LOT-0042-W07")).isEqualTo("LOT-0042");
        assertThat(LotPattern.lotOf(p, "MON-200-W01")).isNull();
        assertThat(LotPattern.lotOf(null, "LOT-0042-W07")).isNull();
        assertThat(LotPattern.parse("{\"limits\": {}}", "rules.json")).isEmpty();
        assertThat(Rules.parse(RULES, "rules.json")).isNotNull(); // the key is part of the rules
    }

    @Test
    void aBadLotPatternIsRefusedNamingTheField() {
        assertThatThrownBy(() -> Rules.parse(RULES.replace("^(LOT-[A-Z0-9]+)-W", "^(LOT"), "r.json"))
                .isInstanceOf(RulesException.class).hasMessageContaining("r.json: field 'lot_pattern'")
                .hasMessageContaining("not a regular expression");
        assertThatThrownBy(() -> Rules.parse(RULES.replace("^(LOT-[A-Z0-9]+)-W", "^LOT-[0-9]+"), "r.json"))
                .isInstanceOf(RulesException.class).hasMessageContaining("must have a group");
        assertThatThrownBy(() -> Rules.parse(RULES.replace("\"^(LOT-[A-Z0-9]+)-W\"", "7"), "r.json"))
                .isInstanceOf(RulesException.class).hasMessageContaining("must be a text");
    }
}
