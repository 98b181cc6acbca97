package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.IntrinsicLifetime;

/**
 * A value computed from published parameters (docs/check-values.md R-CLI-1) reproduced through the command
 * line.
 */
class PublishedValueTest {

    @Test
    void computedIronDensityForATenMicrosecondSrhLifetime(@TempDir Path dir) throws Exception {
        // Fe_i given as in the source's computation: level E_i - 0.182 eV (E_v + 0.38 with E_i at mid-gap,
        // E_g = 1.124 eV), sigma_n 1.3e-14, sigma_p 7e-17 cm^2, Green 1990 thermal velocities.
        Path file = dir.resolve("fe-i-ei.json");
        Files.writeString(file, "{\"id\": \"fe-i-ei\", \"name\": \"interstitial iron, level from E_i\","
                + " \"source\": \"Macdonald, Tan & Trupke, JAP 103, 073710 (2008); level from E_i\","
                + " \"level\": {\"reference\": \"Ei\", \"energy_ev\": -0.182},"
                + " \"sigma_n_cm2\": 1.3e-14, \"sigma_p_cm2\": 7e-17, \"vth_convention\": \"green\"}");
        // tau_SRH = 10 us: add the intrinsic term back to get the effective lifetime the command is given.
        double dn = 1e13;
        double tauIntrUs = IntrinsicLifetime.richter2012(Doping.pType(1e16),
                Silicon.at(300, ThermalVelocityModel.GREEN_1990)).lifetimeS(dn) * 1e6;
        double tauEffUs = 1 / (1 / 10.0 + 1 / tauIntrUs);

        JsonNode j = Cli.json("calc", "--lifetime-us", Double.toString(tauEffUs), "--doping", "p:1e16",
                "--injection", "1e13", "--defect", "fe-i-ei", "--defect-file", file.toString(), "--vth", "green",
                "--json");

        assertThat(j.get("tau_srh_us").asDouble()).isCloseTo(10.0, within(1e-9));
        // Computed value, not a printed one: the closed-form SRH inversion (Shockley & Read / Hall 1952) with the
        // Fe_i set of Macdonald, Tan & Trupke (2008), N_A = 1e16, Δn = 1e13, τ_SRH = 10 µs gives N_t = 4.610e11 cm^-3
        // (docs/check-values.md R-SRH-4 and R-CLI-1); the value carries four digits, so 0.5 %.
        assertThat(j.get("trap_density_cm3").asDouble()).isCloseTo(4.610e11, within(0.005 * 4.610e11));
        assertThat(j.get("warnings")).as("the defect's own velocity convention is used").isEmpty();
    }
}
