package trapmap.physics.recombination;

import static org.assertj.core.api.Assertions.assertThat;
import static trapmap.physics.ReferenceSets.assertRelative;

import java.util.List;
import java.util.SplittableRandom;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.defect.EnergyReference;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.Carriers;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;

/** Textbook SRH properties that hold for any parameters (Shockley &amp; Read 1952; Hall 1952). */
class SrhInvariantsTest {
    private static final List<Defect> WITH_SIGMA = DefectLibrary.all().stream()
            .filter(Defect::hasAbsoluteCrossSections).collect(Collectors.toList());

    // n1·p1 = n_i² for every level reference and degeneracy, at several temperatures (Shockley & Read 1952; exact by
    // detailed balance)
    @Test
    void emissionDensitiesMultiplyToIntrinsicSquared() {
        for (double t : new double[] {250, 300, 350}) {
            for (ThermalVelocityModel v : ThermalVelocityModel.values()) {
                Silicon si = Silicon.at(t, v);
                double ni2 = si.intrinsicPerCm3() * si.intrinsicPerCm3();
                for (EnergyReference ref : EnergyReference.values()) {
                    double[] energies = ref == EnergyReference.INTRINSIC ? new double[] {-0.5, -0.2, 0, 0.3, 0.55}
                            : new double[] {0.05, 0.26, 0.38, 0.56, 1.0};
                    for (double e : energies) {
                        for (double g : new double[] {0.25, 0.5, 1, 2, 4}) {
                            TrapLevel level = new TrapLevel(ref, e, g);
                            assertRelative(level + " n1 p1 at " + t + " K", level.n1PerCm3(si) * level.p1PerCm3(si),
                                    ni2, 1e-12);
                        }
                    }
                }
            }
        }
    }

    // Degeneracy: n1/g and g·p1 relative to g = 1, equivalent to shifting E_t by kT ln g
    // (Schroder, Semiconductor Material and Device Characterization, textbook, from memory; R-SRH-17)
    @Test
    void degeneracyScalesEmissionDensities() {
        Silicon si = Silicon.at(300);
        for (EnergyReference ref : EnergyReference.values()) {
            double e = ref == EnergyReference.INTRINSIC ? 0.1 : 0.4;
            TrapLevel g1 = new TrapLevel(ref, e, 1);
            TrapLevel g4 = new TrapLevel(ref, e, 4);
            assertRelative(ref + " n1/g", g4.n1PerCm3(si), g1.n1PerCm3(si) / 4, 1e-12);
            assertRelative(ref + " g p1", g4.p1PerCm3(si), g1.p1PerCm3(si) * 4, 1e-12);
        }
        // E_i reference: g shifts the level by −kT ln g
        double kt = si.thermalEnergyEv();
        assertRelative("kT ln g shift", new TrapLevel(EnergyReference.INTRINSIC, 0.1, 4).n1PerCm3(si),
                TrapLevel.fromIntrinsic(0.1 - kt * Math.log(4)).n1PerCm3(si), 1e-12);
    }

    // Band-edge rules (R-LIM-3): n1 = N_c exp(−(E_c − E_t)/kT); p1 = N_v exp(−(E_t − E_v)/kT); n1(E_i) = n_i at E_t =
    // E_i
    @Test
    void bandEdgeRules() {
        Silicon si = Silicon.at(300);
        double kt = si.thermalEnergyEv();
        assertRelative("Ec rule", TrapLevel.belowConductionBand(0.3).n1PerCm3(si),
                si.conductionDosPerCm3() * Math.exp(-0.3 / kt), 1e-12);
        assertRelative("Ev rule", TrapLevel.aboveValenceBand(0.3).p1PerCm3(si),
                si.valenceDosPerCm3() * Math.exp(-0.3 / kt), 1e-12);
        assertRelative("Ei rule", TrapLevel.fromIntrinsic(0).n1PerCm3(si), si.intrinsicPerCm3(), 1e-12);
        assertRelative("Ei rule", TrapLevel.fromIntrinsic(0.1).n1PerCm3(si),
                si.intrinsicPerCm3() * Math.exp(0.1 / kt), 1e-12);
    }

    // Limit (R-LIM-1): p-type low injection, mid-gap level → τ_SRH → τ_n0 = 1/(σ_n v_n N_t). The relative deviation is
    // about (n_i + Δn)/N_dop · max(1, c_n/c_p), so 1e18 doping keeps it below 1e-5 for k up to ~170.
    // Limit: n-type low injection → τ_p0 = 1/(σ_p v_p N_t); high injection (Δn ≫ N_dop, n1, p1) → τ_n0 + τ_p0
    @ParameterizedTest(name = "sigma_n {0}, sigma_p {1}")
    @CsvSource({"1e-15, 1e-15", "1e-14, 1e-16", "3e-16, 5e-14"})
    void lifetimeLimitsAtMidGap(double sn, double sp) {
        Silicon si = Silicon.at(300);
        Defect midgap = Defect.of("mid", "mid-gap", TrapLevel.fromIntrinsic(0), sn, sp, ThermalVelocityModel.FIXED,
                "test level", null);
        double nt = 1e11;
        double tn0 = 1 / (sn * si.electronVthCmPerS() * nt);
        double tp0 = 1 / (sp * si.holeVthCmPerS() * nt);
        assertRelative("p-type low injection", SrhRecombination.of(midgap, Doping.pType(1e18), si).lifetimeS(1e6, nt),
                tn0, 1e-5);
        assertRelative("n-type low injection", SrhRecombination.of(midgap, Doping.nType(1e18), si).lifetimeS(1e6, nt),
                tp0, 1e-5);
        assertRelative("high injection", SrhRecombination.of(midgap, Doping.pType(1e12), si).lifetimeS(1e18, nt),
                tn0 + tp0, 1e-5);
        // the library's mid-gap reference level
        Defect lib = DefectLibrary.byId("midgap");
        double tn0Lib = 1 / (1e-15 * 1.1e7 * nt);
        assertRelative("midgap p-type", SrhRecombination.of(lib, Doping.pType(1e16), si).lifetimeS(1e6, nt), tn0Lib,
                1e-5);
        assertRelative("midgap n-type", SrhRecombination.of(lib, Doping.nType(1e16), si).lifetimeS(1e6, nt), tn0Lib,
                1e-5);
        assertRelative("midgap high injection", SrhRecombination.of(lib, Doping.nType(1e12), si).lifetimeS(1e18, nt),
                2 * tn0Lib, 1e-5);
    }

    // f_t ∈ [0, 1] for every library defect, doping and injection; N_t cancels from it
    @Test
    void occupancyIsAFraction() {
        Silicon si = Silicon.at(300);
        for (Defect d : WITH_SIGMA) {
            for (Doping dop : new Doping[] {Doping.pType(1e13), Doping.pType(1e16), Doping.nType(1e15),
                Doping.nType(1e18)}) {
                SrhRecombination srh = SrhRecombination.of(d, dop, si);
                for (double lg = 0; lg <= 19; lg += 0.5) {
                    double ft = srh.occupancy(lg == 0 ? 0 : Math.pow(10, lg));
                    assertThat(ft).as("%s %s dn 1e%s", d.id(), dop, lg).isBetween(0.0, 1.0);
                }
            }
        }
    }

    // f_t limits (R-LIM-2): c_n ≫ c_p → n/(n + n1); c_p ≫ c_n → p1/(p + p1); equal c, high injection, shallow-free
    // level → 1/2;
    // equilibrium (Δn = 0) → Fermi–Dirac occupancy n0/(n0 + n1)
    @Test
    void occupancyLimits() {
        Silicon si = Silicon.at(300);
        double ni = si.intrinsicPerCm3();
        Carriers eq = Doping.pType(1e16).equilibrium(ni);
        double n1 = 1e8;
        double p1 = ni * ni / n1;
        double dn = 1e13;
        double n = eq.electronsPerCm3() + dn;
        double p = eq.holesPerCm3() + dn;
        assertRelative("c_n >> c_p", new SrhRecombination(eq, n1, p1, 1.0, 1e-18).occupancy(dn), n / (n + n1), 1e-9);
        assertRelative("c_p >> c_n", new SrhRecombination(eq, n1, p1, 1e-18, 1.0).occupancy(dn), p1 / (p + p1),
                1e-9);
        assertRelative("high injection", new SrhRecombination(Doping.pType(1e10).equilibrium(ni), ni, ni, 1e-8, 1e-8)
                .occupancy(1e18), 0.5, 1e-6);
        double n0 = eq.electronsPerCm3();
        assertRelative("equilibrium", new SrhRecombination(eq, n1, p1, 3e-8, 7e-10).occupancy(0), n0 / (n0 + n1), 1e-9);
    }

    // The lifetime form used by the conversion against the rate form of Shockley & Read 1952 / Hall 1952,
    // U = (n p − n_i²)/[τ_p0 (n + n1) + τ_n0 (p + p1)], τ_SRH = Δn/U, evaluated here from n1, p1, n0, p0 and N_t,
    // over a seeded random grid of every library defect with absolute σ, p- and n-type 1e12–3e18, Δn 1e8–1e18 and
    // shallow levels (E_t 0.05–0.3 eV from either band edge), 1e-9 (docs/check-values.md R-SRH-18)
    @Test
    void lifetimeAgreesWithTheRateFormOverARandomGrid() {
        SplittableRandom rnd = new SplittableRandom(20240611L);
        Silicon si = Silicon.at(300);
        double ni = si.intrinsicPerCm3();
        for (int i = 0; i < 20000; i++) {
            Defect d = WITH_SIGMA.get(rnd.nextInt(WITH_SIGMA.size()));
            if (rnd.nextInt(3) == 0) {
                double e = rnd.nextDouble(0.05, 0.3);
                d = Defect.of("shallow", "shallow level", rnd.nextBoolean() ? TrapLevel.aboveValenceBand(e)
                        : TrapLevel.belowConductionBand(e), d.electronCrossSectionCm2(), d.holeCrossSectionCm2(),
                        ThermalVelocityModel.FIXED, "random case", null);
            }
            double level = Math.pow(10, rnd.nextDouble(12, 18.5));
            Doping dop = rnd.nextBoolean() ? Doping.pType(level) : Doping.nType(level);
            double dn = Math.pow(10, rnd.nextDouble(8, 18));
            double nt = Math.pow(10, rnd.nextDouble(8, 15));
            Carriers eq = dop.equilibrium(ni);
            double n = eq.electronsPerCm3() + dn;
            double p = eq.holesPerCm3() + dn;
            double tn0 = 1 / (d.electronCrossSectionCm2() * si.electronVthCmPerS() * nt);
            double tp0 = 1 / (d.holeCrossSectionCm2() * si.holeVthCmPerS() * nt);
            double u = (n * p - ni * ni)
                    / (tp0 * (n + d.level().n1PerCm3(si)) + tn0 * (p + d.level().p1PerCm3(si)));
            double tau = SrhRecombination.of(d, dop, si).lifetimeS(dn, nt);
            assertRelative(d.id() + " " + d.level() + " " + dop + " dn " + dn, tau, dn / u, 1e-9);
        }
    }
}
