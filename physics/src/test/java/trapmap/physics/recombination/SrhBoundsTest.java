package trapmap.physics.recombination;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.defect.EnergyReference;
import trapmap.physics.defect.ParameterSpread;
import trapmap.physics.defect.Range;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.Carriers;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;

/**
 * The density bounds claim to be the exact extremes of N_t over the published spread of (E_t, σ_n, σ_p). Checked
 * against a brute-force search over a dense grid inside the spread: the bounds never lie inside the grid's range
 * (lower ≤ grid minimum, upper ≥ grid maximum) and match the grid extremes within its resolution.
 */
class SrhBoundsTest {
    private static final int ENERGY_STEPS = 400;
    private static final int SIGMA_STEPS = 8;

    static Stream<Arguments> cases() {
        List<Defect> defects = new ArrayList<>();
        for (Defect d : DefectLibrary.all()) {
            if (d.hasAbsoluteCrossSections() && d.spread() != null) {
                defects.add(d);
            }
        }
        // spreads whose density minimum lies strictly inside the energy range, for each level reference
        defects.add(Defect.of("wide-ei", "wide spread from E_i", TrapLevel.fromIntrinsic(0.05), 1e-15, 1e-15,
                ThermalVelocityModel.FIXED, "test",
                new ParameterSpread(new Range(-0.25, 0.25), new Range(5e-16, 4e-15), new Range(2e-16, 2e-15), "test")));
        defects.add(Defect.of("wide-ev", "wide spread from E_v", TrapLevel.aboveValenceBand(0.45), 2e-15, 1e-16,
                ThermalVelocityModel.FIXED, "test",
                new ParameterSpread(new Range(0.3, 0.75), new Range(1e-15, 5e-15), new Range(5e-17, 3e-16), "test")));
        defects.add(Defect.of("wide-ec-g", "wide spread from E_c, g = 4",
                new TrapLevel(EnergyReference.CONDUCTION_BAND, 0.5, 4), 1e-16, 5e-15, ThermalVelocityModel.FIXED,
                "test",
                new ParameterSpread(new Range(0.35, 0.8), new Range(5e-17, 3e-16), new Range(1e-15, 8e-15), "test")));
        List<Arguments> out = new ArrayList<>();
        Doping[] dopings = {Doping.pType(1e15), Doping.pType(1e16), Doping.nType(3e15), Doping.nType(1e17)};
        double[] injections = {1e10, 1e13, 1e15, 1e17};
        for (Defect d : defects) {
            for (Doping dop : dopings) {
                for (double dn : injections) {
                    out.add(Arguments.of(d, dop, dn));
                }
            }
        }
        return out.stream();
    }

    @ParameterizedTest(name = "{0} {1} dn {2}")
    @MethodSource("cases")
    void boundsAreTheGridExtremes(Defect defect, Doping doping, double dn) {
        Silicon si = Silicon.at(300);
        ParameterSpread s = defect.spread();
        Carriers eq = doping.equilibrium(si.intrinsicPerCm3());
        double n0 = eq.electronsPerCm3();
        double p0 = eq.holesPerCm3();
        double gridMin = Double.POSITIVE_INFINITY;
        double gridMax = 0;
        double[] argMin = null;
        int energySteps = s.energyEv().min() == s.energyEv().max() ? 0 : ENERGY_STEPS;
        for (int i = 0; i <= energySteps; i++) {
            double e = energySteps == 0 ? s.energyEv().min()
                    : s.energyEv().min() + (s.energyEv().max() - s.energyEv().min()) * i / energySteps;
            TrapLevel level = defect.level().withEnergy(e);
            double n1 = level.n1PerCm3(si);
            double p1 = level.p1PerCm3(si);
            for (int j = 0; j <= SIGMA_STEPS; j++) {
                double cn = geometric(s.electronCrossSectionCm2(), j) * si.electronVthCmPerS();
                for (int k = 0; k <= SIGMA_STEPS; k++) {
                    double cp = geometric(s.holeCrossSectionCm2(), k) * si.holeVthCmPerS();
                    // K = τ_SRH·N_t = [(n0 + n1 + Δn)/c_p + (p0 + p1 + Δn)/c_n]/(n0 + p0 + Δn)
                    double kk = ((n0 + n1 + dn) / cp + (p0 + p1 + dn) / cn) / (n0 + p0 + dn);
                    if (kk < gridMin) {
                        gridMin = kk;
                        argMin = new double[] {e, cn / si.electronVthCmPerS(), cp / si.holeVthCmPerS()};
                    }
                    gridMax = Math.max(gridMax, kk);
                }
            }
        }
        // the grid's minimum evaluated through the public forward path agrees with the formula above
        assertThat(SrhRecombination.of(defect.withParameters(argMin[0], argMin[1], argMin[2]), doping, si)
                .lifetimeDensityProductSCm3(dn) / gridMin - 1).isCloseTo(0.0, org.assertj.core.data.Offset.offset(1e-12));
        SrhBounds b = SrhBounds.of(defect, doping, si);
        double lower = b.lower().lifetimeDensityProductSCm3(dn);
        double upper = b.upper().lifetimeDensityProductSCm3(dn);
        double nominal = SrhRecombination.of(defect, doping, si).lifetimeDensityProductSCm3(dn);
        assertThat(lower).as("lower <= nominal").isLessThanOrEqualTo(nominal * (1 + 1e-12));
        assertThat(upper).as("upper >= nominal").isGreaterThanOrEqualTo(nominal * (1 - 1e-12));
        // never inside the searched range
        assertThat(lower).as("lower <= grid minimum").isLessThanOrEqualTo(gridMin * (1 + 1e-12));
        assertThat(upper).as("upper >= grid maximum").isGreaterThanOrEqualTo(gridMax * (1 - 1e-12));
        // and equal to the extremes within the grid resolution: the maximum sits at the range ends (on the grid),
        // the minimum may lie between energy nodes (step ≤ 1.2 meV: relative error ≤ (ΔE/2kT)²/2 < 3e-4)
        assertThat(gridMin / lower - 1).as("grid minimum vs lower bound").isLessThanOrEqualTo(5e-4);
        assertThat(1 - gridMax / upper).as("grid maximum vs upper bound").isLessThanOrEqualTo(1e-9);
    }

    private static double geometric(Range r, int j) {
        if (r.min() == r.max()) {
            return r.min();
        }
        double v = r.min() * Math.pow(r.max() / r.min(), (double) j / SIGMA_STEPS);
        return r.clamp(v);
    }

    // Every built-in spread contains the nominal parameters, so min ≤ nominal ≤ max holds for the library
    @org.junit.jupiter.api.Test
    void libraryNominalInsideSpread() {
        for (Defect d : DefectLibrary.all()) {
            if (d.spread() == null) {
                continue;
            }
            ParameterSpread s = d.spread();
            assertThat(s.energyEv().contains(d.level().energyEv())).as(d.id() + " energy").isTrue();
            assertThat(s.electronCrossSectionCm2().contains(d.electronCrossSectionCm2())).as(d.id() + " sigma_n")
                    .isTrue();
            assertThat(s.holeCrossSectionCm2().contains(d.holeCrossSectionCm2())).as(d.id() + " sigma_p").isTrue();
        }
    }
}
