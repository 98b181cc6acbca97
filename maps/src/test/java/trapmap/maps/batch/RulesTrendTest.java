package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.time.Instant;
import java.util.EnumSet;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.RunRule;
import trapmap.maps.trend.TrendSettings;
import trapmap.physics.conversion.PhysicsSettings;

/** The rules' optional {@code trend} block and {@link TrendSettings}. */
class RulesTrendTest {
    /** Rules that report trap_density_p50_cm3 (a limit names it), with a trend block put in place of TREND. */
    private static final String RULES = "{'defect': 'fe-i', 'flag': {'quantity': 'trap-density', 'threshold': 3e11},"
            + " 'limits': {'trap_density_p50_cm3': {'max': 6e10}}TREND}";

    private static Rules parse(String trend) throws RulesException {
        return Rules.parse(RULES.replace("TREND", trend).replace('\'', '"'), "r.json");
    }

    @Test
    void withoutTheBlockThereIsNoTrend() throws Exception {
        assertThat(parse("").trend()).isEmpty();
        assertThat(parse(", 'trend': null").trend()).isEmpty();
    }

    @Test
    void theSummaryChartsTheBlockElseTheFirstLimitedFigureByLotWithoutAlarm() throws Exception {
        Rules withBlock = parse(", 'trend': {'figure': 'median_lifetime_us', 'by': 'furnace_tube'}");
        assertThat(withBlock.summaryTrend()).isEqualTo(withBlock.trend().orElseThrow());

        TrendSettings fallback = parse("").summaryTrend();
        assertThat(fallback).isEqualTo(parse("").defaultTrend());
        assertThat(fallback.figure()).isEqualTo("trap_density_p50_cm3"); // the default profile's first limit
        assertThat(fallback.by()).isEqualTo("lot");
        assertThat(fallback.baseline()).isEqualTo(Baseline.first(Baseline.DEFAULT_COUNT));
        assertThat(fallback.alarmRules()).isEmpty();

        Rules noLimits = Rules.parse("{\"defect\": \"fe-i\", \"flag\": {\"quantity\": \"lifetime\", \"threshold\": 20}}",
                "r.json");
        assertThat(noLimits.summaryTrend().figure()).isEqualTo("harmonic_mean_lifetime_us"); // always reported
    }

    @Test
    void aBlockWithOnlyTheFigureTakesTheDefaults() throws Exception {
        TrendSettings t = parse(", 'trend': {'figure': 'trap_density_p50_cm3'}").trend().orElseThrow();
        assertThat(t).isEqualTo(TrendSettings.defaults("trap_density_p50_cm3"));
        assertThat(t.by()).isEqualTo("lot");
        assertThat(t.baseline()).isEqualTo(Baseline.first(Baseline.DEFAULT_COUNT));
        assertThat(t.alarmRules()).containsExactly(RunRule.BEYOND_3_SIGMA);
    }

    @Test
    void everyKeyIsRead() throws Exception {
        TrendSettings t = parse(", 'trend': {'figure': 'trap_density_p50_cm3', 'by': 'furnace_tube',"
                + " 'baseline': 12, 'alarm_rules': ['six_trending', 'beyond_3_sigma', 'eight_on_one_side']}")
                .trend().orElseThrow();
        assertThat(t.figure()).isEqualTo("trap_density_p50_cm3");
        assertThat(t.by()).isEqualTo("furnace_tube");
        assertThat(t.baseline()).isEqualTo(Baseline.first(12));
        // in RunRule order, whatever the file's order
        assertThat(t.alarmRules()).containsExactly(RunRule.BEYOND_3_SIGMA, RunRule.EIGHT_ON_ONE_SIDE,
                RunRule.SIX_TRENDING);
        assertThat(t.alarms(RunRule.SIX_TRENDING)).isTrue();
        assertThat(t.alarms(RunRule.TWO_OF_THREE_BEYOND_2_SIGMA)).isFalse();
    }

    @Test
    void baselineUntilTakesADateAsItsUtcStartOrATime() throws Exception {
        assertThat(parse(", 'trend': {'figure': 'median_lifetime_us', 'baseline_until': '2026-10-12'}")
                .trend().orElseThrow().baseline()).isEqualTo(Baseline.before(Instant.parse("2026-10-12T00:00:00Z")));
        assertThat(parse(", 'trend': {'figure': 'median_lifetime_us', 'baseline_until': '2026-10-12T08:30:00Z'}")
                .trend().orElseThrow().baseline()).isEqualTo(Baseline.before(Instant.parse("2026-10-12T08:30:00Z")));
    }

    @Test
    void anEmptyAlarmListRaisesNoAlarm() throws Exception {
        TrendSettings t = parse(", 'trend': {'figure': 'median_lifetime_us', 'alarm_rules': []}").trend()
                .orElseThrow();
        assertThat(t.alarmRules()).isEmpty();
        assertThat(t.describe()).endsWith("alarm on no signal");
    }

    @Test
    void everyRunRuleHasItsKey() throws Exception {
        for (RunRule r : RunRule.values()) {
            String key = TrendSettings.key(r);
            assertThat(parse(", 'trend': {'figure': 'median_lifetime_us', 'alarm_rules': ['" + key + "']}")
                    .trend().orElseThrow().alarmRules()).containsExactly(r);
        }
    }

    @Test
    void aFigureOfAProfileCounts() throws Exception {
        Rules r = Rules.parse(("{'flag': {'quantity': 'lifetime', 'threshold': 10}, 'profiles': [{'name': 'n',"
                + " 'match': {'type': 'n'}, 'limits': {'p10_lifetime_us': {'min': 5}}}],"
                + " 'trend': {'figure': 'p10_lifetime_us'}}").replace('\'', '"'), "r.json");
        assertThat(r.trend().orElseThrow().figure()).isEqualTo("p10_lifetime_us");
    }

    @Test
    void otherPhysicsKeepTheTrend() throws Exception {
        Rules r = parse(", 'trend': {'figure': 'trap_density_p50_cm3', 'by': 'day'}");
        assertThat(r.withPhysics(PhysicsSettings.DEFAULTS).trend()).isEqualTo(r.trend());
    }

    @ParameterizedTest(name = "{1}")
    @CsvSource(delimiter = '|', value = {
        "'trend': 3|field 'trend': must be an object",
        "'trend': {}|field 'trend.figure': is required",
        "'trend': {'figure': 'mean_lifetime_us'}|field 'trend.figure': unknown figure",
        "'trend': {'figure': 'p10_lifetime_us'}|field 'trend.figure': 'p10_lifetime_us' is not reported by these rules",
        "'trend': {'figure': 'median_lifetime_us', 'colour': 'red'}|field 'trend.colour': unknown key",
        "'trend': {'figure': 'median_lifetime_us', 'by': ''}|field 'trend.by': must be a non-empty text",
        "'trend': {'figure': 'median_lifetime_us', 'by': 4}|field 'trend.by': must be a non-empty text",
        "'trend': {'figure': 'median_lifetime_us', 'baseline': 1}|field 'trend.baseline': must be in [2, 1e6] but was 1 (charted wafers)",
        "'trend': {'figure': 'median_lifetime_us', 'baseline': 12.5}|field 'trend.baseline': must be a whole number but was 12.5 (charted wafers)",
        "'trend': {'figure': 'median_lifetime_us', 'baseline': '20'}|field 'trend.baseline': must be a number",
        "'trend': {'figure': 'median_lifetime_us', 'baseline_until': '12.10.2026'}|field 'trend.baseline_until': must be a UTC date (2026-10-12) or time",
        "'trend': {'figure': 'median_lifetime_us', 'baseline': 20, 'baseline_until': '2026-10-12'}|field 'trend.baseline_until': excludes trend.baseline",
        "'trend': {'figure': 'median_lifetime_us', 'alarm_rules': 'beyond_3_sigma'}|field 'trend.alarm_rules': must be an array",
        "'trend': {'figure': 'median_lifetime_us', 'alarm_rules': ['BEYOND_3_SIGMA']}|field 'trend.alarm_rules[0]': 'BEYOND_3_SIGMA' is not a run rule; expected one of beyond_3_sigma, two_of_three_beyond_2_sigma",
        "'trend': {'figure': 'median_lifetime_us', 'alarm_rules': ['six_trending', 'six_trending']}|field 'trend.alarm_rules[1]': 'six_trending' is given twice",
    })
    void badBlocksNameTheFileAndTheField(String trend, String expected) {
        assertThatThrownBy(() -> parse(", " + trend))
                .isInstanceOf(RulesException.class)
                .hasMessageStartingWith("r.json: ")
                .hasMessageContaining(expected)
                .hasMessageNotContaining("\n");
    }

    @Test
    void settingsAreImmutableAndOrdered() {
        Set<RunRule> given = EnumSet.of(RunRule.SIX_TRENDING, RunRule.BEYOND_3_SIGMA);
        TrendSettings t = new TrendSettings("median_lifetime_us", " ", Baseline.first(5), given);
        given.clear();
        assertThat(t.alarmRules()).containsExactly(RunRule.BEYOND_3_SIGMA, RunRule.SIX_TRENDING);
        assertThat(t.by()).isEqualTo(TrendSettings.DEFAULT_BY);
        assertThatThrownBy(() -> t.alarmRules().add(RunRule.EIGHT_ON_ONE_SIDE))
                .isInstanceOf(UnsupportedOperationException.class);
        assertThat(t.describe()).isEqualTo("figure median_lifetime_us; by lot; baseline first 5 wafers; alarm on"
                + " 1 point beyond 3 sigma, 6 in a row rising or falling");
    }
}
