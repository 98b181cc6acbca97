package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import trapmap.maps.model.MeasurementConditions;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.Doping;

class RulesTest {
    private static final String FLAG = "\"flag\": {\"quantity\": \"lifetime\", \"threshold\": 10}";

    private static Rules parse(String json) throws RulesException {
        return Rules.parse(json, "r.json");
    }

    @Test
    void exampleRulesFileParses() throws Exception {
        Rules r = Rules.read(Path.of("..", "demo-data", "rules-example.json"));
        assertThat(r.defectId()).isEqualTo("fe-i");
        assertThat(r.grades()).extracting(Rules.Grade::grade).containsExactly("A", "B");
        assertThat(r.failGrade()).isEqualTo("R");
        assertThat(r.figures()).extracting(Figure::name).contains("harmonic_mean_lifetime_us",
                "trap_density_p95_cm3", "flagged_area_fraction", "largest_region_mm2", "largest_interior_region_mm2");
        assertThat(r.profiles()).extracting(Rules.Profile::name).containsExactly("n-type", "ic-monitor",
                "after-gettering", "iron-boron-pairs");
        assertThat(r.profiles()).extracting(Rules.Profile::defectId).containsExactly("midgap", "fe-i", "fe-i",
                "fe-b");
    }

    @Test
    void minimalRulesNeedOnlyAFlag() throws Exception {
        Rules r = parse("{" + FLAG + "}");
        assertThat(r.flag().threshold()).isEqualTo(10);
        assertThat(r.edgeExclusionMm()).isZero();
        assertThat(r.waferFormat()).isNull();
        assertThat(r.needsTrapDensity()).isFalse();
    }

    @ParameterizedTest(name = "{1}")
    @CsvSource(delimiter = '|', value = {
        "{'flag': {'quantity': 'lifetime', 'threshold': 10}, 'colour': 1}|field 'colour': unknown key",
        "{}|field 'flag': is required",
        "{'flag': {'quantity': 'iron', 'threshold': 10}}|field 'flag.quantity'",
        "{'flag': {'quantity': 'lifetime'}}|field 'flag.threshold': is required (µs)",
        "{'flag': {'quantity': 'lifetime', 'threshold': -3}}|field 'flag.threshold': must be in",
        "{'flag': {'quantity': 'lifetime', 'threshold': '10'}}|field 'flag.threshold': must be a number",
        "{'flag': {'quantity': 'lifetime', 'threshold': 10, 'min_area_mm2': -1}}|field 'flag.min_area_mm2'",
        "{'flag': {'quantity': 'lifetime', 'threshold': 10, 'area': 1}}|field 'flag.area': unknown key",
        "{'flag': {'quantity': 'trap-density', 'threshold': 1e11}}|field 'defect': is required",
        "{'defect': 'unobtainium', 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'defect': unknown defect",
        "{'edge_exclusion_mm': 80, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'edge_exclusion_mm': must be in [0, 50] but was 80 (mm)",
        "{'wafer': 'round-7', 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'wafer'",
        "{'conditions': {'doping': 'x:3'}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'conditions.doping'",
        "{'conditions': {'thickness_um': 0}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'conditions.thickness_um': must be in [1, 5000] but was 0 (µm)",
        "{'conditions': {'srv_cm_s': -1}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'conditions.srv_cm_s'",
        "{'conditions': {'injection_cm3': 1e20}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'conditions.injection_cm3': must be in [1e6, 1e19] but was 1e20 (cm^-3)",
        "{'conditions': {'temperature_k': 1000}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'conditions.temperature_k'",
        "{'conditions': {'injection_cm3': 1e14, 'generation_cm3_s': 1e19}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'conditions.generation_cm3_s'",
        "{'conditions': {'override': 'yes'}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'conditions.override'",
        "{'conditions': {'pressure': 1}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'conditions.pressure': unknown key",
        "{'limits': {'mean_lifetime_us': {'min': 1}}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'limits.mean_lifetime_us': unknown figure",
        "{'limits': {'median_lifetime_us': {}}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'limits.median_lifetime_us': needs min, max or both (µs)",
        "{'limits': {'median_lifetime_us': {'min': 5, 'max': 1}}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'limits.median_lifetime_us.min'",
        "{'limits': {'median_lifetime_us': {'least': 5}}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'limits.median_lifetime_us.least': unknown key",
        "{'limits': {'trap_density_p95_cm3': {'max': 1e11}}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'defect': is required",
        "{'limits': {'p100_lifetime_us': {'min': 1}}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'limits.p100_lifetime_us'",
        "{'grades': {'grade': 'A'}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'grades': must be an array",
        "{'grades': [{'when': {}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'grades[0].grade': is required",
        "{'grades': [{'grade': 'A'}, {'grade': 'A'}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'grades[1].grade'",
        "{'grades': [{'grade': 'A', 'when': {'x': {'min': 1}}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'grades[0].when.x': unknown figure",
        "{'edge_band_mm': 0, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'edge_band_mm'",
        "{'fail_grade': 'A', 'grades': [{'grade': 'A'}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'fail_grade': 'A' is also a grade of passing wafers",
        "{'profiles': {'name': 'n'}, 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles': must be an array",
        "{'profiles': [{'match': {'type': 'n'}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].name': is required",
        "{'profiles': [{'name': 'default', 'match': {'type': 'n'}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].name': 'default' is given twice",
        "{'profiles': [{'name': 'n'}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].match': is required",
        "{'profiles': [{'name': 'n', 'match': {}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].match': needs type, wafer, file",
        "{'profiles': [{'name': 'n', 'match': {'type': 'x'}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].match.type': must be p or n",
        "{'profiles': [{'name': 'n', 'match': {'wafer': ['round-7']}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].match.wafer': 'round-7' is not a known format",
        "{'profiles': [{'name': 'n', 'match': {'file': '*.{tif'}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].match.file': not a valid glob",
        "{'profiles': [{'name': 'n', 'match': {'type': 'n'}, 'colour': 1}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].colour': unknown key",
        "{'profiles': [{'name': 'n', 'match': {'type': 'n'}, 'defect': 'unobtainium'}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].defect': unknown defect",
        "{'profiles': [{'name': 'n', 'match': {'type': 'n'}, 'flag': {'quantity': 'trap-density', 'threshold': 1e12}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].defect': is required",
        "{'profiles': [{'name': 'n', 'match': {'type': 'n'}, 'flag': {'quantity': 'lifetime'}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].flag.threshold': is required (µs)",
        "{'profiles': [{'name': 'n', 'match': {'type': 'n'}, 'limits': {'x': {'min': 1}}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].limits.x': unknown figure",
        "{'fail_grade': 'R', 'profiles': [{'name': 'n', 'match': {'type': 'n'}, 'grades': [{'grade': 'R'}]}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].fail_grade': the inherited 'R'",
        "{'profiles': [{'name': 'n', 'match': {'file': '[c-a]'}}], 'flag': {'quantity': 'lifetime', 'threshold': 10}}|field 'profiles[0].match.file': not a valid glob: invalid range at index 1",
    })
    void invalidRulesNameTheField(String json, String expected) {
        assertThatThrownBy(() -> parse(json.replace('\'', '"')))
                .isInstanceOf(RulesException.class)
                .hasMessageStartingWith("r.json: ")
                .hasMessageContaining(expected);
    }

    @Test
    void overlongNamesGlobsAndGradesNameTheFieldAndTheLimit() {
        String flag = ", 'flag': {'quantity': 'lifetime', 'threshold': 10}}";
        assertThatThrownBy(() -> parse(("{'profiles': [{'name': '" + "n".repeat(257) + "', 'match': {'type': 'n'}}]"
                + flag).replace('\'', '"'))).hasMessage("r.json: field 'profiles[0].name': is 257 characters long;"
                + " at most 256 are allowed");
        assertThatThrownBy(() -> parse(("{'profiles': [{'name': 'n', 'match': {'file': '" + "*".repeat(1025)
                + "'}}]" + flag).replace('\'', '"'))).hasMessage("r.json: field 'profiles[0].match.file': is 1025"
                + " characters long; at most 1024 are allowed");
        assertThatThrownBy(() -> parse(("{'grades': [{'grade': '" + "A".repeat(257) + "'}]" + flag)
                .replace('\'', '"'))).hasMessage("r.json: field 'grades[0].grade': is 257 characters long; at most"
                + " 256 are allowed");
    }

    @Test
    void aProfileGlobWithTwentyTwoStarsPicksTheProfileOfALongNameAtOnce() throws Exception {
        Rules r = parse(("{'profiles': [{'name': 'stars', 'match': {'file': '" + "*a".repeat(21) + "*b'}}],"
                + " 'flag': {'quantity': 'lifetime', 'threshold': 10}}").replace('\'', '"'));
        String noMatch = "a".repeat(10_000);
        String match = "a".repeat(9_999) + "b";
        assertThat(org.junit.jupiter.api.Assertions.assertTimeoutPreemptively(java.time.Duration.ofSeconds(10),
                () -> r.profileFor(noMatch, null, "m2").name())).isEqualTo(Rules.DEFAULT_PROFILE);
        assertThat(r.profileFor(match, null, "m2").name()).isEqualTo("stars");
    }

    @Test
    void theFirstMatchingProfileJudgesAMapAndInheritsWhatItLeavesOut() throws Exception {
        Rules r = parse("""
                {"defect": "fe-i", "flag": {"quantity": "trap-density", "threshold": 3e11},
                 "limits": {"harmonic_mean_lifetime_us": {"min": 50}}, "fail_grade": "R",
                 "profiles": [
                   {"name": "n", "match": {"type": "n"}, "defect": "midgap"},
                   {"name": "mon", "match": {"type": "p", "wafer": ["round-200-notch"]},
                    "flag": {"quantity": "lifetime", "threshold": 100}},
                   {"name": "pairs", "match": {"file": "*-feb-state.*"}, "defect": "fe-b"}]}
                """);
        assertThat(r.profileFor("w1.tif", ConductivityType.N, "m10").name()).isEqualTo("n");
        assertThat(r.profileFor("w1.tif", ConductivityType.N, "m10").defectId()).isEqualTo("midgap");
        assertThat(r.profileFor("w1.tif", ConductivityType.N, "m10").flag().threshold()).isEqualTo(3e11);
        assertThat(r.profileFor("w1.tif", ConductivityType.N, "m10").failGrade()).isEqualTo("R");
        assertThat(r.profileFor("w1.tif", ConductivityType.P, "round-200-notch").name()).isEqualTo("mon");
        assertThat(r.profileFor("w1.tif", ConductivityType.P, "round-200-notch").defectId()).isEqualTo("fe-i");
        assertThat(r.profileFor("w1.tif", ConductivityType.P, "m2").name()).isEqualTo(Rules.DEFAULT_PROFILE);
        assertThat(r.profileFor("x-feb-state.tif", ConductivityType.P, "m2").defectId()).isEqualTo("fe-b");
        assertThat(r.profileFor("x-feb-state.tif", null, "m2").name()).isEqualTo("pairs");
        assertThat(r.profileFor("w1.tif", null, "round-200-notch").name()).isEqualTo(Rules.DEFAULT_PROFILE);
        assertThat(r.figures()).extracting(Figure::name).containsExactly("harmonic_mean_lifetime_us",
                "median_lifetime_us", "flagged_area_fraction", "largest_region_mm2", "invalid_area_fraction",
                "below_limit_area_fraction");
        // a profile that computes no trap density reports no below-limit share, but always its invalid area
        assertThat(r.profileFor("w1.tif", ConductivityType.P, "round-200-notch").figures()).extracting(Figure::name)
                .doesNotContain("below_limit_area_fraction").contains("invalid_area_fraction");
    }

    @Test
    void aSizeFamilyMatchesBothMarksAndTheWafersWhoseMarkWasNotResolved() throws Exception {
        Rules r = parse("""
                {"flag": {"quantity": "lifetime", "threshold": 100},
                 "profiles": [
                   {"name": "notch", "match": {"wafer": "round-300-notch"}},
                   {"name": "mon", "match": {"wafer": ["round-200", "round-300"]}}]}
                """);
        assertThat(r.profileFor("w.tif", null, "round-200").name()).isEqualTo("mon");
        assertThat(r.profileFor("w.tif", null, "round-200-flat").name()).isEqualTo("mon");
        assertThat(r.profileFor("w.tif", null, "round-200-notch").name()).isEqualTo("mon");
        assertThat(r.profileFor("w.tif", null, "round-300-notch").name()).isEqualTo("notch");
        assertThat(r.profileFor("w.tif", null, "round-300").name()).isEqualTo("mon");
        assertThat(r.profileFor("w.tif", null, "round-150-flat").name()).isEqualTo(Rules.DEFAULT_PROFILE);
        assertThat(r.profileFor("w.tif", null, "fitted").name()).isEqualTo(Rules.DEFAULT_PROFILE);
    }

    @Test
    void aPassingWaferIsGradedByTheFirstGradeItMeetsAndAFailedOneByTheFailGrade() throws Exception {
        Rules r = parse("{" + FLAG + ", \"fail_grade\": \"R\", \"grades\": ["
                + "{\"grade\": \"A\", \"when\": {\"median_lifetime_us\": {\"min\": 100},"
                + " \"largest_region_mm2\": {\"max\": 0}}},"
                + "{\"grade\": \"B\", \"when\": {\"median_lifetime_us\": {\"min\": 50}}}, {\"grade\": \"C\"}]}");
        Rules.Profile p = r.defaultProfile();
        java.util.function.ToDoubleFunction<Figure> good = f -> f.name().equals("median_lifetime_us") ? 120 : 0;
        java.util.function.ToDoubleFunction<Figure> fair = f -> f.name().equals("median_lifetime_us") ? 120 : 3;
        assertThat(p.grade(false, good)).isEqualTo("A");
        assertThat(p.grade(true, good)).isEqualTo("R");
        assertThat(p.grade(false, fair)).isEqualTo("B");
        assertThat(p.missedBy("B", fair)).containsExactly("largest_region_mm2");
        assertThat(p.missedBy("A", good)).isEmpty();
    }

    @Test
    void invalidJsonGivesLineAndColumn() {
        assertThatThrownBy(() -> parse("{\n  \"flag\": {,}\n}")).isInstanceOf(RulesException.class)
                .hasMessageContaining("line 2").hasMessageContaining("not valid JSON");
    }

    @Test
    void theHeadStartLeavesReadingAsStrictAsBefore() throws Exception {
        String example = java.nio.file.Files.readString(java.nio.file.Path.of("..", "demo-data",
                "rules-example.json"));
        Rules before = parse(example);
        Rules.prepare();
        assertThat(parse(example).toString()).isEqualTo(before.toString());
        assertThatThrownBy(() -> parse("{\"flag\": {}, \"flag\": {}}")).isInstanceOf(RulesException.class)
                .hasMessageContaining("flag"); // duplicate keys stay refused
        assertThatThrownBy(() -> parse("{} {}")).isInstanceOf(RulesException.class); // and trailing tokens
    }

    @Test
    void sidecarConditionsWinUnlessOverride() throws Exception {
        String c = "\"conditions\": {\"doping\": \"p:1e16\", \"thickness_um\": 180, \"injection_cm3\": 1e14%s}, ";
        Rules fill = parse("{" + c.formatted("") + FLAG + "}");
        Rules over = parse("{" + c.formatted(", \"override\": true") + FLAG + "}");
        MeasurementConditions file = MeasurementConditions.UNKNOWN.withThickness(200.0).withGeneration(1e19);
        MeasurementConditions a = fill.applyTo(file);
        assertThat(a.thicknessUm()).isEqualTo(200.0);
        assertThat(a.generationPerCm3PerS()).isEqualTo(1e19);
        assertThat(a.injectionPerCm3()).isNull();
        assertThat(a.doping()).isEqualTo(Doping.pType(1e16));
        MeasurementConditions b = over.applyTo(file);
        assertThat(b.thicknessUm()).isEqualTo(180.0);
        assertThat(b.injectionPerCm3()).isEqualTo(1e14);
        assertThat(b.generationPerCm3PerS()).isNull();
    }

    @Test
    void limitsWithNaNFail() {
        Rules.Limit l = new Rules.Limit(Figure.parse("median_lifetime_us"), 1, Double.NaN);
        assertThat(l.holds(2)).isTrue();
        assertThat(l.holds(0.5)).isFalse();
        assertThat(l.holds(Double.NaN)).isFalse();
    }

    @Test
    void aLineBreakInAKeyStaysOnTheMessagesOneLine() {
        assertThatThrownBy(() -> Rules.parse("{\"conditions\": {\"ov\\rride\": false}}", "r.json"))
                .isInstanceOf(RulesException.class)
                .hasMessageStartingWith("r.json: field 'conditions.ov\\rride': unknown key")
                .satisfies(e -> assertThat(e.getMessage()).doesNotContain("\r").doesNotContain("\n"));
    }

    @Test
    void aBadDopingNamesItsUnitOnce() {
        assertThatThrownBy(() -> parse(("{'conditions': {'doping': 'p:-1e16'}" + ", " + FLAG.replace('"', '\'')
                + "}").replace('\'', '"'))).hasMessage("r.json: field 'conditions.doping': density must be in [1e10,"
                + " 1e19] cm^-3 (got -1e16)");
        assertThatThrownBy(() -> parse(("{'conditions': {'doping': 'p:0ohmcm'}" + ", " + FLAG.replace('"', '\'')
                + "}").replace('\'', '"'))).hasMessageEndingWith("Ω·cm (got 0)");
    }
}
