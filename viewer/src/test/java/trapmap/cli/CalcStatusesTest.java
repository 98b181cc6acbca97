package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** The statuses of single values: the 1 ns lifetime floor, the two-sided detection limit and inconsistent iron. */
class CalcStatusesTest {

    @ParameterizedTest
    @ValueSource(strings = {"1e-300", "1e-12", "0.0009"})
    void lifetimesBelowTheFloorEndWithOneLineAndExitTwo(String tau) {
        Cli.Run r = Cli.run("calc", "--lifetime-us=" + tau, "--doping", "p:1e16", "--injection", "1e14", "--defect",
                "fe-i");
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.out()).isEmpty();
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).contains("--lifetime-us").contains(">= 0.001 µs").contains("(got " + tau + ")")
                .doesNotContain("Exception");
    }

    @Test
    void aLifetimeInSecondsTypedAsMicrosecondsIsNamed() {
        Cli.Run r = Cli.run("calc", "--lifetime-us", "12.5e-6", "--doping", "p:1e16", "--injection", "1e14",
                "--defect", "fe-i", "--json");
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).contains("looks like a lifetime in seconds typed as µs").contains("= 12.5 µs");
    }

    @Test
    void theFloorItselfConvertsWithTheDensityWarning() {
        JsonNode j = Cli.json("calc", "--lifetime-us", "0.001", "--doping", "p:1e16", "--injection", "1e14",
                "--defect", "fe-i", "--json");
        assertThat(j.get("status").asText()).isEqualTo("OK");
        assertThat(j.get("trap_density_cm3").asDouble()).isGreaterThan(1e16);
        assertThat(j.get("warning_codes").toString()).contains("TRAP_DENSITY_NOT_SMALL");
    }

    @Test
    void aLifetimeJustBelowTheLimitIsBelowTheLimitNotATinyDensity() {
        // p 1e16, Δn 1e15, fe-i: the limit lifetime τ_lim (intrinsic only) is the reported tau_intrinsic_us
        JsonNode far = Cli.json("calc", "--lifetime-us", "1", "--doping", "p:1e16", "--injection", "1e15",
                "--defect", "fe-i", "--json");
        double tauLim = far.get("tau_intrinsic_us").asDouble();
        double previous = 0;
        for (double f : new double[] {1.01, 1.0, 0.999, 0.99, 0.96, 0.9, 0.5}) {
            JsonNode j = Cli.json("calc", "--lifetime-us", Double.toString(f * tauLim), "--doping", "p:1e16",
                    "--injection", "1e15", "--defect", "fe-i", "--json");
            String expected = f > 1 / 1.05 ? "BELOW_LIMIT" : "OK";
            assertThat(j.get("status").asText()).as("%s τ_lim", f).isEqualTo(expected);
            assertThat(j.get("trap_density_is_upper_bound").asBoolean()).isEqualTo(expected.equals("BELOW_LIMIT"));
            double nt = j.get("trap_density_cm3").asDouble();
            assertThat(nt).as("%s τ_lim", f).isGreaterThanOrEqualTo(previous).isGreaterThan(8e8);
            previous = nt;
        }
    }

    @Test
    void ironThatMovedTheWrongWayIsInconsistent() {
        JsonNode j = Cli.json("calc", "iron", "--before-us", "20", "--after-us", "8", "--doping", "p:1e15",
                "--injection", "1e14", "--json");
        assertThat(j.get("status").asText()).isEqualTo("INCONSISTENT");
        assertThat(j.get("fe_i_cm3").isNull()).isTrue();
        assertThat(j.get("fe_i_is_upper_bound").asBoolean()).isFalse();
        assertThat(j.get("reason").asText()).contains("above the Fe_i/FeB crossover").contains("raise");
        JsonNode swapped = Cli.json("calc", "iron", "--before-us", "8", "--after-us", "20", "--doping", "p:1e15",
                "--injection", "1e14", "--json");
        assertThat(swapped.get("status").asText()).isEqualTo("OK");
        assertThat(swapped.get("reason").isNull()).isTrue();
        Cli.Run table = Cli.run("calc", "iron", "--before-us", "20", "--after-us", "8", "--doping", "p:1e15",
                "--injection", "1e14");
        assertThat(table.out()).contains("INCONSISTENT").contains("reason: the lifetime fell");
    }

    @Test
    void ironNearTheCrossoverWarns() {
        JsonNode j = Cli.json("calc", "iron", "--before-us", "8", "--after-us", "20", "--doping", "p:1e15",
                "--injection", "6e13", "--json");
        assertThat(j.get("warning_codes").toString()).contains("NEAR_IRON_CROSSOVER");
    }
}
