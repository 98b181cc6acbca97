package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.iron.IronImaging;
import trapmap.physics.iron.IronResult;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.pl.PlCalibration;

class SubcommandsTest {
    @Test
    void ironAgreesWithIronImaging() {
        JsonNode j = Cli.json("calc", "iron", "--before-us", "20", "--after-us", "8", "--doping", "p:1e16",
                "--injection", "1e13", "--json");
        IronImaging iron = new IronImaging(Doping.pType(1e16), Silicon.at(300));
        IronResult r = iron.evaluate(20, 8, 1e13);
        assertThat(j.get("status").asText()).isEqualTo("OK");
        assertThat(j.get("fe_i_cm3").asDouble()).isEqualTo(r.ironPerCm3());
        assertThat(j.get("prefactor_us_cm3").asDouble()).isEqualTo(r.prefactorUsCm3());
        // the library's fe-i/fe-b at N_A 1e16, v_th 1.1e7 cm/s: 1.1848e14 cm^-3 (Macdonald, Geerligs & Azzizi, JAP 95,
        // 1021 (2004), computed; docs/check-values.md R-FE-5), 0.5 %
        assertThat(j.get("crossover_cm3").asDouble()).isEqualTo(iron.crossoverPerCm3())
                .isCloseTo(1.1848e14, org.assertj.core.api.Assertions.within(0.005 * 1.1848e14));
        assertThat(j.get("warnings").isArray()).isTrue();
        assertThat(j.get("warnings")).isEmpty();
        assertThat(j.get("caution").asText()).contains("verify with an independent method");
    }

    @Test
    void ironWithGreenVelocitiesAndTemperatureNearTheCrossover() {
        Silicon si = Silicon.at(305, ThermalVelocityModel.GREEN_1990);
        IronImaging iron = new IronImaging(Doping.pType(1e16), si);
        double dn = iron.crossoverPerCm3() * 1.5;
        JsonNode j = Cli.json("calc", "iron", "--before-us", "20", "--after-us", "30", "--doping", "p:1e16",
                "--injection", Double.toString(dn), "--temperature", "305", "--vth", "green", "--json");
        IronResult r = iron.evaluate(20, 30, dn);
        assertThat(j.get("fe_i_cm3").asDouble()).isEqualTo(r.ironPerCm3());
        assertThat(j.get("status").asText()).isEqualTo(r.status().name());
        assertThat(j.get("warnings").toString()).contains(ConversionWarning.NEAR_IRON_CROSSOVER.message())
                .contains(ConversionWarning.VELOCITY_CONVENTION.message());
    }

    @Test
    void ironTableHasUnits() {
        Cli.Run r = Cli.run("calc", "iron", "--before-us", "20", "--after-us", "8", "--doping", "p:1e16",
                "--injection", "1e13");
        assertThat(r.code()).isZero();
        assertThat(r.out()).contains("interstitial iron [Fe_i]").contains("cm^-3").contains("µs·cm^-3");
    }

    @Test
    void boronOxygenAgreesWithThePhysics() {
        JsonNode j = Cli.json("calc", "bo", "--degraded-us", "40", "--annealed-us", "300", "--json");
        // N_t* = 1/τ_degraded − 1/τ_annealed (Bothe & Schmidt, JAP 99, 013701 (2006); docs/check-values.md R-DEF-12)
        assertThat(j.get("normalised_density_per_us").asDouble())
                .isCloseTo(1.0 / 40 - 1.0 / 300, org.assertj.core.api.Assertions.within(1e-15));
        assertThat(j.get("warnings")).isEmpty();
        JsonNode none = Cli.json("calc", "bo", "--degraded-us", "300", "--annealed-us", "300", "--json");
        assertThat(none.get("normalised_density_per_us").asDouble()).isZero();
        assertThat(none.get("warnings").get(0).asText()).contains("no light-induced degradation");
    }

    @Test
    void plAgreesWithTheCalibration() {
        JsonNode j = Cli.json("calc", "pl", "--counts", "12000", "--reference-counts", "8000",
                "--reference-lifetime-us", "50", "--generation", "1e19", "--doping", "p:1e16", "--json");
        PlCalibration cal = PlCalibration.fromReference(8000, 50, 1e19, 1e16);
        assertThat(j.get("calibration_constant").asDouble()).isEqualTo(cal.constant());
        assertThat(j.get("injection_cm3").asDouble()).isEqualTo(cal.injectionPerCm3(12000));
        assertThat(j.get("lifetime_us").asDouble()).isEqualTo(cal.lifetimeUs(12000, 1e19));
        // The reference itself comes back with its own lifetime.
        JsonNode ref = Cli.json("calc", "pl", "--counts", "8000", "--reference-counts", "8000",
                "--reference-lifetime-us", "50", "--generation", "1e19", "--doping", "p:1e16", "--json");
        assertThat(ref.get("lifetime_us").asDouble()).isCloseTo(50.0, org.assertj.core.data.Offset.offset(1e-9));
    }
}
