package trapmap.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.assertj.core.api.ThrowableAssert.ThrowingCallable;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.Surface;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.BoronOxygen;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.defect.EnergyReference;
import trapmap.physics.defect.Range;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.AstmF723;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.DensityOfStatesModel;
import trapmap.physics.material.Doping;
import trapmap.physics.material.IntrinsicDensityModel;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.IntrinsicLifetime;
import trapmap.physics.recombination.RadiativeCoefficient;
import trapmap.physics.recombination.SurfaceLifetime;
import trapmap.physics.recombination.SurfaceModel;
import trapmap.shared.error.InvalidValueException;

/**
 * Every checked input of the physics API rejects negative, NaN, infinite and out-of-range values with an
 * {@link InvalidValueException} that names the field and its unit (PL and iron inputs are covered in their own
 * packages; user-defined defect descriptions in {@code DefectSpecsTest}).
 */
class InvalidInputTest {
    private static final double NAN = Double.NaN;
    private static final double INF = Double.POSITIVE_INFINITY;

    private static final List<Arguments> CASES = new ArrayList<>();

    private static void add(String label, String field, String unit, ThrowingCallable call) {
        CASES.add(Arguments.of(label, field, unit, call));
    }

    private static void addAll(String label, String field, String unit, double[] bad,
                               java.util.function.DoubleConsumer use) {
        for (double b : bad) {
            add(label + "(" + b + ")", field, unit, () -> use.accept(b));
        }
    }

    static Stream<Arguments> cases() {
        CASES.clear();
        Silicon si = Silicon.at(300);
        Doping p16 = Doping.pType(1e16);
        // temperature, K
        addAll("Silicon.at", "temperature", "K", new double[] {NAN, -1, 0, 76.9, 500.1, INF, -INF}, Silicon::at);
        addAll("Silicon.of", "temperature", "K", new double[] {NAN, -300, 1000},
                t -> Silicon.of(t, IntrinsicDensityModel.COUDERC_2014, DensityOfStatesModel.COUDERC_2014,
                        ThermalVelocityModel.GREEN_1990));
        addAll("new Silicon", "temperature", "K", new double[] {NAN, -300},
                t -> new Silicon(t, 9.65e9, 2.86e19, 3.1e19, 1.1e7, 1.1e7, ThermalVelocityModel.FIXED));
        // band parameters
        addAll("withIntrinsicDensity", "intrinsicDensity", "cm^-3", new double[] {NAN, -1, 0, INF},
                si::withIntrinsicDensity);
        addAll("withDensitiesOfStates N_c", "conductionBandDensityOfStates", "cm^-3", new double[] {NAN, -1, 0, INF},
                v -> si.withDensitiesOfStates(v, 3.1e19));
        addAll("withDensitiesOfStates N_v", "valenceBandDensityOfStates", "cm^-3", new double[] {NAN, -1, 0},
                v -> si.withDensitiesOfStates(2.86e19, v));
        addAll("withThermalVelocities e", "electronThermalVelocity", "cm/s", new double[] {NAN, -1, 0, INF},
                v -> si.withThermalVelocities(v, 1.1e7));
        addAll("withThermalVelocities h", "holeThermalVelocity", "cm/s", new double[] {NAN, -1e7, 0},
                v -> si.withThermalVelocities(1.1e7, v));
        // doping, cm^-3
        addAll("Doping.pType", "doping", "cm^-3", new double[] {NAN, -1e16, 0, 9.9e9, 1.1e19, INF}, Doping::pType);
        addAll("Doping.nType", "doping", "cm^-3", new double[] {NAN, -1e15, 0, INF}, Doping::nType);
        add("new Doping(null)", "doping type", "", () -> new Doping(null, 1e16));
        // resistivity, ohm*cm (ASTM F723 validity 1e-4 … 1e4)
        addAll("AstmF723.boronPerCm3", "resistivity", "ohm*cm", new double[] {NAN, -1, 0, 9e-5, 1.1e4, INF},
                AstmF723::boronPerCm3);
        addAll("AstmF723.phosphorusPerCm3", "resistivity", "ohm*cm", new double[] {NAN, -1, 0, 2e4, INF},
                AstmF723::phosphorusPerCm3);
        addAll("Doping.fromResistivity", "resistivity", "ohm*cm", new double[] {NAN, -2, 0},
                r -> Doping.fromResistivity(ConductivityType.P, r));
        addAll("AstmF723.boronResistivityOhmCm", "dopantDensity", "cm^-3", new double[] {NAN, -1, 0, 9e11, 2e21, INF},
                AstmF723::boronResistivityOhmCm);
        addAll("AstmF723.phosphorusResistivityOhmCm", "dopantDensity", "cm^-3", new double[] {NAN, 9e11, 6e20},
                AstmF723::phosphorusResistivityOhmCm);
        // injection, cm^-3 and generation, cm^-3 s^-1
        addAll("Injection.fixed", "injection", "cm^-3", new double[] {NAN, -1e14, 0, 9e5, 2e19, INF},
                Injection::fixed);
        addAll("Injection.generation", "generation", "cm^-3 s^-1", new double[] {NAN, -1e19, 0, 9e9, 2e24, INF},
                Injection::generation);
        // thickness and surface recombination velocity
        addAll("Surface.sproul thickness", "thickness", "um", new double[] {NAN, -180, 0, 0.5, 6000, INF},
                w -> Surface.sproul(w, 100));
        addAll("Surface.sproul SRV", "surfaceRecombinationVelocity", "cm/s", new double[] {NAN, -1, 2e7, INF},
                s -> Surface.sproul(180, s));
        add("new Surface(null model)", "surface model", "", () -> new Surface(180, 10, null));
        addAll("SurfaceLifetime.sproulS thickness", "thickness", "cm", new double[] {NAN, -0.018, 0, INF},
                w -> SurfaceLifetime.sproulS(w, 10, 30));
        addAll("SurfaceLifetime.exactS thickness", "thickness", "cm", new double[] {NAN, -0.018, 0},
                w -> SurfaceLifetime.exactS(w, 10, 30));
        addAll("SurfaceLifetime.sproulS SRV", "surfaceRecombinationVelocity", "cm/s", new double[] {NAN, -1, INF},
                s -> SurfaceLifetime.sproulS(0.018, s, 30));
        addAll("SurfaceLifetime.exactS SRV", "surfaceRecombinationVelocity", "cm/s", new double[] {NAN, -10},
                s -> SurfaceLifetime.lifetimeS(SurfaceModel.EXACT, 0.018, s, 30));
        addAll("SurfaceLifetime diffusivity", "diffusivity", "cm^2/s", new double[] {NAN, -30, 0, INF},
                d -> SurfaceLifetime.sproulS(0.018, 10, d));
        addAll("SurfaceLifetime.exactS diffusivity", "diffusivity", "cm^2/s", new double[] {NAN, 0},
                d -> SurfaceLifetime.exactS(0.018, 10, d));
        // capture cross-sections, cm^2 (valid 1e-25 … 1e-10)
        addAll("Defect.of sigma_n", "sigma_n", "cm^2", new double[] {1e-26, 1e-9},
                s -> Defect.of("x", "x", TrapLevel.fromIntrinsic(0), s, 1e-15, ThermalVelocityModel.FIXED, "", null));
        addAll("Defect.of sigma_p", "sigma_p", "cm^2", new double[] {1e-26, 1e-9},
                s -> Defect.of("x", "x", TrapLevel.fromIntrinsic(0), 1e-15, s, ThermalVelocityModel.FIXED, "", null));
        add("Defect k mismatch", "captureRatio", "", () -> new Defect("x", "x", TrapLevel.fromIntrinsic(0), 1e-15,
                1e-15, 2, ThermalVelocityModel.FIXED, "", null));
        addAll("Defect k without sigma", "captureRatio", "", new double[] {NAN, 0, -9.3, INF},
                k -> new Defect("x", "x", TrapLevel.fromIntrinsic(0), NAN, NAN, k, ThermalVelocityModel.FIXED, "",
                        null));
        add("Defect id", "id", "", () -> Defect.of("Fe i", "x", TrapLevel.fromIntrinsic(0), 1e-15, 1e-15,
                ThermalVelocityModel.FIXED, "", null));
        add("Defect null level", "level", "", () -> Defect.of("x", "x", null, 1e-15, 1e-15,
                ThermalVelocityModel.FIXED, "", null));
        // trap level: degeneracy (dimensionless) and energy, eV
        for (EnergyReference ref : EnergyReference.values()) {
            addAll("TrapLevel degeneracy " + ref, "degeneracy", "", new double[] {NAN, -1, 0, INF},
                    g -> new TrapLevel(ref, 0.3, g));
            double[] badEnergy = ref == EnergyReference.INTRINSIC ? new double[] {NAN, -0.61, 0.61, INF}
                    : new double[] {NAN, -0.01, 1.21, INF};
            addAll("TrapLevel energy " + ref, "energy", "eV", badEnergy, e -> new TrapLevel(ref, e, 1));
        }
        add("TrapLevel null reference", "reference", "", () -> new TrapLevel(null, 0.3, 1));
        // conditions and converter
        addAll("Conditions radiative", "radiativeCoefficient", "cm^3/s", new double[] {NAN, -1e-15, 0, INF},
                b -> new Conditions(p16, si, Injection.fixed(1e14), Surface.IDEAL, b, 0.05, NAN));
        addAll("Conditions resolution", "detectionResolution", "", new double[] {NAN, -0.05, 0, 1.5, INF},
                r -> Conditions.of(p16, Injection.fixed(1e14)).withDetectionResolution(r));
        addAll("Conditions reference injection", "referenceInjection", "cm^-3", new double[] {-1, 0, 1e5, 1e20, INF},
                r -> Conditions.of(p16, Injection.fixed(1e14)).withReferenceInjection(r));
        add("Conditions null doping", "doping", "", () -> Conditions.of(null, Injection.fixed(1e14)));
        add("Conditions null injection", "injection", "", () -> Conditions.of(p16, null));
        add("Conditions null surface", "surface", "", () -> Conditions.of(p16, Injection.fixed(1e14))
                .withSurface(null));
        add("Conditions null silicon", "silicon", "", () -> Conditions.of(p16, Injection.fixed(1e14))
                .withSilicon(null));
        addAll("IntrinsicLifetime B_low", "radiativeCoefficient", "cm^3/s", new double[] {NAN, -4.73e-15, 0},
                b -> IntrinsicLifetime.richter2012(p16, si, b));
        TrapDensityConverter conv = new TrapDensityConverter(Conditions.of(p16, Injection.fixed(1e14)),
                DefectLibrary.byId("fe-i"));
        addAll("lifetimeAtInjectionUs density", "trapDensity", "cm^-3", new double[] {NAN, -1e10, INF},
                n -> conv.lifetimeAtInjectionUs(n, 1e14));
        addAll("lifetimeAtInjectionUs injection", "injection", "cm^-3", new double[] {NAN, -1e14, 0, INF},
                dn -> conv.lifetimeAtInjectionUs(1e10, dn));
        add("converter null conditions", "conditions", "", () -> new TrapDensityConverter(null,
                DefectLibrary.byId("fe-i")));
        add("converter null defect", "defect", "", () -> new TrapDensityConverter(
                Conditions.of(p16, Injection.fixed(1e14)), null));
        // boron–oxygen pair, µs
        addAll("BoronOxygen degraded", "degradedLifetime", "us", new double[] {NAN, -40, 0, INF},
                t -> BoronOxygen.normalisedDensityPerUs(t, 300));
        addAll("BoronOxygen annealed", "annealedLifetime", "us", new double[] {NAN, -300, 0, INF},
                t -> BoronOxygen.normalisedDensityPerUs(40, t));
        // published-value ranges
        addAll("Range min", "min", "", new double[] {NAN, INF}, v -> new Range(v, 1));
        addAll("Range max", "max", "", new double[] {NAN, INF}, v -> new Range(0, v));
        return CASES.stream().map(a -> a);
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("cases")
    void rejectedWithFieldAndUnit(String label, String field, String unit, ThrowingCallable call) {
        assertThatThrownBy(call).as(label).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining(field)
                .hasMessageContaining(trapmap.shared.units.Units.label(unit)) // shown as µm, µs
                .satisfies(e -> assertThat(((InvalidValueException) e).field()).as(label).isEqualTo(field))
                .satisfies(e -> assertThat(((InvalidValueException) e).unit()).as(label).isEqualTo(unit));
    }

    // The boundaries themselves are accepted (the checks are not off by one)
    @Test
    void boundariesAreAccepted() {
        assertThat(Silicon.at(77).temperatureK()).isEqualTo(77);
        assertThat(Silicon.at(500).temperatureK()).isEqualTo(500);
        assertThat(Doping.pType(1e10).densityPerCm3()).isEqualTo(1e10);
        assertThat(Doping.nType(1e19).densityPerCm3()).isEqualTo(1e19);
        assertThat(Injection.fixed(1e6)).isNotNull();
        assertThat(Injection.fixed(1e19)).isNotNull();
        assertThat(Injection.generation(1e10)).isNotNull();
        assertThat(Injection.generation(1e24)).isNotNull();
        assertThat(Surface.sproul(1, 0).ideal()).isTrue();
        assertThat(Surface.sproul(5000, 1e7).ideal()).isFalse();
        assertThat(AstmF723.boronPerCm3(1e4)).isPositive();
        assertThat(new TrapLevel(EnergyReference.INTRINSIC, -0.6, 1)).isNotNull();
        assertThat(new TrapLevel(EnergyReference.CONDUCTION_BAND, 1.2, 1)).isNotNull();
        assertThat(Defect.of("x", "x", TrapLevel.fromIntrinsic(0), 1e-25, 1e-10, ThermalVelocityModel.FIXED, "",
                null).captureRatio()).isEqualTo(1e-15);
        assertThat(RadiativeCoefficient.relative(0, 300)).isEqualTo(1.0);
    }

    // One cross-section without the other: the exception names the missing cross-section (sigma_n) and cm^2
    @Test
    void oneCrossSectionMissing() {
        assertThatThrownBy(() -> new Defect("x", "x", TrapLevel.fromIntrinsic(0), NAN, 1e-15, 5,
                ThermalVelocityModel.FIXED, "", null)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("cross-section").hasMessageContaining("cm^2")
                .satisfies(e -> assertThat(((InvalidValueException) e).field()).isEqualTo("sigma_n"))
                .satisfies(e -> assertThat(((InvalidValueException) e).unit()).isEqualTo("cm^2"));
    }

    // Range needs min ≤ max
    @Test
    void rangeOrder() {
        assertThatThrownBy(() -> new Range(2, 1)).isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("min <= max");
    }

    // Negative or zero cross-sections must be reported under the cross-section's own field and unit.
    @Test
    void negativeOrZeroCrossSectionsNameTheirField() {
        assertThatThrownBy(() -> Defect.of("x", "x", TrapLevel.fromIntrinsic(0), NAN, 1e-15,
                ThermalVelocityModel.FIXED, "", null)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("sigma").hasMessageContaining("cm^2");
        for (double bad : new double[] {-1e-15, 0}) {
            assertThatThrownBy(() -> Defect.of("x", "x", TrapLevel.fromIntrinsic(0), bad, 1e-15,
                    ThermalVelocityModel.FIXED, "", null)).isInstanceOf(InvalidValueException.class)
                    .hasMessageContaining("sigma_n").hasMessageContaining("cm^2");
            assertThatThrownBy(() -> Defect.of("x", "x", TrapLevel.fromIntrinsic(0), 1e-15, bad,
                    ThermalVelocityModel.FIXED, "", null)).isInstanceOf(InvalidValueException.class)
                    .hasMessageContaining("sigma_p").hasMessageContaining("cm^2");
        }
    }
}
