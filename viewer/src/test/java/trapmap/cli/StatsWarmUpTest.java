package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;

/**
 * The kernel's warm-up in {@code stats} runs before the map's own conditions are known: where the flags leave the
 * injection or the surface open, it must take every path a map can choose (a fixed injection or a generation rate, a
 * surface term or none), each with conditions the conversion accepts.
 */
class StatsWarmUpTest {
    @Test
    void openConditionsAreWarmedUpForEveryPath() {
        List<MeasurementConditions> cases = StatsCommand.warmUpCases(true, true);
        assertThat(cases).hasSize(4);
        assertThat(cases.stream().map(StatsWarmUpTest::path).distinct())
                .containsExactlyInAnyOrder("fixed surface", "fixed ideal", "generation surface", "generation ideal");
    }

    @Test
    void conditionsTheFlagsSettleAreWarmedUpOnce() {
        assertThat(StatsCommand.warmUpCases(false, false)).hasSize(1);
        assertThat(StatsCommand.warmUpCases(true, false).stream().map(StatsWarmUpTest::path))
                .containsExactlyInAnyOrder("generation surface", "fixed surface");
        assertThat(StatsCommand.warmUpCases(false, true).stream().map(StatsWarmUpTest::path))
                .containsExactlyInAnyOrder("generation surface", "generation ideal");
    }

    @Test
    void theFlagsOverEachCaseAreTheGuesses() {
        StatsCommand c = new StatsCommand();
        c.conditions = new MapConditionOptions();
        c.conditions.injection = 3e14;
        List<MeasurementConditions> guesses = c.warmUpGuesses();
        assertThat(guesses).hasSize(2).allSatisfy(g -> assertThat(g.injectionPerCm3()).isEqualTo(3e14));
        assertThat(guesses.stream().map(StatsWarmUpTest::path))
                .containsExactlyInAnyOrder("fixed surface", "fixed ideal");
    }

    /** Which of the kernel's paths the conversion of a map measured under {@code c} takes. */
    private static String path(MeasurementConditions c) {
        Conditions p = MapConversion.physicsConditions(c, ConversionSettings.DEFAULTS);
        return (p.injection() instanceof Injection.Fixed ? "fixed" : "generation") + " "
                + (c.srvCmPerS() != null && c.srvCmPerS() > 0 ? "surface" : "ideal");
    }
}
