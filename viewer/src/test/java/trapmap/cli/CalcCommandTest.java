package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PixelResult;
import trapmap.physics.conversion.Surface;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.AstmF723;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.RadiativeCoefficient;
import trapmap.physics.recombination.SurfaceModel;

class CalcCommandTest {
    private static final String[] BASE = {"calc", "--lifetime-us", "12.5", "--doping", "p:1e16", "--injection", "1e14",
        "--defect", "fe-i"};

    private static String[] with(String[] base, String... more) {
        List<String> all = new ArrayList<>(List.of(base));
        all.addAll(List.of(more));
        return all.toArray(String[]::new);
    }

    @Test
    void jsonHasEveryDocumentedField() {
        JsonNode j = Cli.json(with(BASE, "--json"));
        assertThat(j.isObject()).isTrue();
        for (String f : List.of("status", "trap_density_cm3", "trap_density_min_cm3", "trap_density_max_cm3",
                "occupancy", "occupied_density_cm3", "tau_srh_us", "tau_intrinsic_us", "tau_surface_us",
                "tau_effective_us", "n0_cm3", "p0_cm3", "n1_cm3", "p1_cm3", "injection_cm3", "doping_cm3",
                "doping_type", "temperature_k", "defect", "defect_source", "warnings", "caution")) {
            assertThat(j.has(f)).as(f).isTrue();
        }
        assertThat(j.has("lifetime_at_reference_us")).isFalse();
        assertThat(j.get("caution").asText()).isEqualTo(trapmap.maps.model.Caution.TEXT);
        assertThat(j.get("warnings").isArray()).isTrue();
    }

    @Test
    void jsonAgreesWithTheConverter() {
        JsonNode j = Cli.json(with(BASE, "--json"));
        Defect feI = DefectLibrary.byId("fe-i");
        TrapDensityConverter c = new TrapDensityConverter(Conditions.of(Doping.pType(1e16), Injection.fixed(1e14)),
                feI);
        PixelResult r = c.convert(12.5);
        assertThat(j.get("status").asText()).isEqualTo("OK");
        assertThat(j.get("trap_density_cm3").asDouble()).isEqualTo(r.trapDensityPerCm3());
        assertThat(j.get("trap_density_min_cm3").asDouble()).isEqualTo(r.trapDensityMinPerCm3());
        assertThat(j.get("trap_density_max_cm3").asDouble()).isEqualTo(r.trapDensityMaxPerCm3());
        assertThat(j.get("occupancy").asDouble()).isEqualTo(r.occupancy());
        assertThat(j.get("occupied_density_cm3").asDouble()).isEqualTo(r.occupiedDensityPerCm3());
        assertThat(j.get("tau_srh_us").asDouble()).isEqualTo(r.srhLifetimeUs());
        assertThat(j.get("tau_intrinsic_us").asDouble()).isEqualTo(r.intrinsicLifetimeUs());
        assertThat(j.get("tau_effective_us").asDouble()).isEqualTo(12.5);
        assertThat(j.get("tau_surface_us").isNull()).as("ideal surfaces: infinite, written as null").isTrue();
        assertThat(j.get("n0_cm3").asDouble()).isEqualTo(c.srh().n0PerCm3());
        assertThat(j.get("p0_cm3").asDouble()).isEqualTo(c.srh().p0PerCm3());
        assertThat(j.get("n1_cm3").asDouble()).isEqualTo(c.srh().n1PerCm3());
        assertThat(j.get("p1_cm3").asDouble()).isEqualTo(c.srh().p1PerCm3());
        assertThat(j.get("injection_cm3").asDouble()).isEqualTo(1e14);
        assertThat(j.get("doping_cm3").asDouble()).isEqualTo(1e16);
        assertThat(j.get("doping_type").asText()).isEqualTo("p");
        assertThat(j.get("temperature_k").asDouble()).isEqualTo(300.0);
        assertThat(j.get("defect").asText()).isEqualTo("fe-i");
        assertThat(j.get("defect_source").asText()).isEqualTo(feI.source());
        assertThat(j.get("defect_level").asText()).isEqualTo("E_v + 0.38 eV");
        assertThat(j.get("warnings")).isEmpty();
    }

    @Test
    void surfaceGenerationTemperatureAndReferenceAgreeWithTheConverter() {
        JsonNode j = Cli.json("calc", "--lifetime-us", "30", "--doping", "n:5e15", "--generation", "1e19",
                "--defect", "cr-i", "--temperature", "310", "--thickness-um", "180", "--srv", "10",
                "--surface-model", "exact", "--vth", "green", "--reference-injection", "1e15", "--json");
        Conditions cond = new Conditions(Doping.nType(5e15), Silicon.at(310, ThermalVelocityModel.GREEN_1990),
                Injection.generation(1e19), new Surface(180, 10, SurfaceModel.EXACT),
                RadiativeCoefficient.TRUPKE_2003_CM3_PER_S, Conditions.DEFAULT_RESOLUTION, 1e15);
        TrapDensityConverter c = new TrapDensityConverter(cond, DefectLibrary.byId("cr-i"));
        PixelResult r = c.convert(30);
        assertThat(j.get("trap_density_cm3").asDouble()).isEqualTo(r.trapDensityPerCm3());
        assertThat(j.get("injection_cm3").asDouble()).isEqualTo(r.injectionPerCm3());
        assertThat(j.get("tau_surface_us").asDouble()).isEqualTo(c.surfaceLifetimeUs());
        assertThat(j.get("lifetime_at_reference_us").asDouble()).isEqualTo(r.lifetimeAtReferenceUs());
        assertThat(j.get("generation_cm3_s").asDouble()).isEqualTo(1e19);
        assertThat(j.get("temperature_k").asDouble()).isEqualTo(310.0);
        assertThat(j.get("vth_model").asText()).isEqualTo("green");
        List<String> warnings = new ArrayList<>();
        j.get("warnings").forEach(w -> warnings.add(w.asText()));
        assertThat(warnings).contains(ConversionWarning.TEMPERATURE_NOT_300K.message(),
                ConversionWarning.VELOCITY_CONVENTION.message());
    }

    @Test
    void thicknessAloneAddsNoSurfaceTerm() {
        JsonNode ideal = Cli.json(with(BASE, "--json"));
        JsonNode thick = Cli.json(with(BASE, "--thickness-um", "180", "--json"));
        assertThat(thick.get("tau_surface_us").isNull()).isTrue();
        assertThat(thick.get("trap_density_cm3").asDouble()).isEqualTo(ideal.get("trap_density_cm3").asDouble());
    }

    @Test
    void belowTheDetectionLimitWritesNullSrhLifetimeAndAnUpperBound() {
        Cli.Run r = Cli.run("calc", "--lifetime-us", "20000", "--doping", "p:1e16", "--injection", "1e14",
                "--defect", "fe-i", "--json");
        JsonNode j = Cli.parse(r.out());
        assertThat(r.code()).isZero();
        assertThat(r.out()).doesNotContain("Infinity").doesNotContain("NaN");
        assertThat(j.get("status").asText()).isEqualTo("BELOW_LIMIT");
        assertThat(j.get("tau_srh_us").isNull()).isTrue();
        assertThat(j.get("trap_density_is_upper_bound").asBoolean()).isTrue();
        // the limit K·δ/τ_intr (docs/check-values.md R-LIM-12, computed): K of fe-i (Macdonald, Tan & Trupke,
        // JAP 103, 073710 (2008): σ_n 1.3e-14, σ_p 7e-17 cm², v_th 1.1e7 cm/s) at p0 1e16, Δn 1e14 from the SRH
        // equation, 1.98603e7 s cm^-3; δ = 0.05 (R-LIM-7); τ_intr 8.8148e-3 s (Richter et al., PRB 86, 165202
        // (2012), R-INTR-1): 1.1265e8 cm^-3, 0.5 %
        assertThat(j.get("trap_density_cm3").asDouble()).isCloseTo(1.1265e8,
                org.assertj.core.api.Assertions.within(0.005 * 1.1265e8));
    }

    @ParameterizedTest
    @ValueSource(strings = {"p:1.5ohmcm", "p:1.5Ohm.cm", "p:1.5 ohm*cm", "P:1.5OHMCM", "p:1.5Ω·cm", "p: 1.5 ohm-cm"})
    void resistivitySpellingsUseAstmF723(String doping) {
        JsonNode j = Cli.json("calc", "--lifetime-us", "12.5", "--doping", doping, "--injection", "1e14", "--defect",
                "fe-i", "--json");
        assertThat(j.get("doping_cm3").asDouble()).isEqualTo(AstmF723.boronPerCm3(1.5));
        assertThat(j.get("resistivity_ohm_cm").asDouble()).isEqualTo(1.5);
        assertThat(j.get("doping_type").asText()).isEqualTo("p");
    }

    @Test
    void nTypeResistivityIsPhosphorus() {
        JsonNode j = Cli.json("calc", "--lifetime-us", "500", "--doping", "n:2ohmcm", "--injection", "1e14",
                "--defect", "au-a", "--json");
        assertThat(j.get("doping_cm3").asDouble()).isEqualTo(AstmF723.phosphorusPerCm3(2));
        assertThat(j.get("doping_type").asText()).isEqualTo("n");
    }

    @Test
    void densitySpellingsAreAccepted() {
        for (String d : List.of("p:1e16", "p:1E16", "p:1e16cm^-3", "p:1e16 cm-3", "p:10000000000000000")) {
            JsonNode j = Cli.json("calc", "--lifetime-us", "12.5", "--doping", d, "--injection", "1e14", "--defect",
                    "fe-i", "--json");
            assertThat(j.get("doping_cm3").asDouble()).as(d).isEqualTo(1e16);
            assertThat(j.has("resistivity_ohm_cm")).isFalse();
        }
    }

    @Test
    void tableHasUnitsAndTheCaution() {
        Cli.Run r = Cli.run(BASE);
        assertThat(r.code()).isZero();
        assertThat(r.err()).isEmpty();
        assertThat(r.out()).contains("trap density N_t").contains("cm^-3").contains("τ_SRH").contains("µs")
                .contains("infinite (no surface term)").contains("caution: " + trapmap.maps.model.Caution.TEXT);
        String densityLine = r.out().lines().filter(l -> l.startsWith("trap density N_t")).findFirst().orElseThrow();
        String tauLine = r.out().lines().filter(l -> l.startsWith("effective lifetime")).findFirst().orElseThrow();
        assertThat(densityLine.indexOf("1.587e12")).as("values aligned").isEqualTo(tauLine.indexOf("12.5"));
    }

    @Test
    void userDefectFromAFile(@TempDir Path dir) throws Exception {
        Path file = dir.resolve("mine.json");
        Files.writeString(file, "{\"defects\": [{\"id\": \"fe-i-alt\", \"source\": \"test set\", \"level\":"
                + " {\"reference\": \"Ev\", \"energy_ev\": 0.38}, \"sigma_n_cm2\": 5e-14, \"sigma_p_cm2\": 7e-17}]}");
        JsonNode j = Cli.json(with(new String[] {"calc", "--lifetime-us", "12.5", "--doping", "p:1e16", "--injection",
            "1e14", "--defect", "FE-I-ALT", "--json"}, "--defect-file", file.toString()));
        Defect alt = Defect.of("fe-i-alt", "fe-i-alt", DefectLibrary.byId("fe-i").level(), 5e-14, 7e-17,
                ThermalVelocityModel.FIXED, "test set", null);
        PixelResult r = new TrapDensityConverter(Conditions.of(Doping.pType(1e16), Injection.fixed(1e14)), alt)
                .convert(12.5);
        assertThat(j.get("defect").asText()).isEqualTo("fe-i-alt");
        assertThat(j.get("defect_origin").asText()).isEqualTo(file.toString());
        assertThat(j.get("trap_density_cm3").asDouble()).isEqualTo(r.trapDensityPerCm3());
    }

    @Test
    void boronOxygenIsRefusedWithThePhysicsExplanation() {
        Cli.Run r = Cli.run("calc", "--lifetime-us", "12.5", "--doping", "p:1e16", "--injection", "1e14", "--defect",
                "bo-lid");
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.out()).isEmpty();
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).startsWith("trapmap calc: --defect 'bo-lid' has no published absolute capture"
                + " cross-section").contains("N_t* = 1/tau_degraded - 1/tau_annealed").contains("trapmap calc bo");
    }
}
