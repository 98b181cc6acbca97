package trapmap.physics.recombination;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.defect.ParameterSpread;
import trapmap.physics.defect.Range;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;

/**
 * Exact claims of the recombination classes that the published-value tests leave open: that SrhBounds are the
 * extremes over the whole published spread, the accuracy of the fast power, and the choice of surface model.
 * The mutation-testing run (scripts/mutation) showed these gaps.
 */
class RecombinationMutationGuardTest {

    // SrhBounds (class comment): N_t = K/τ, and K is largest with both σ at their minima and the level energy at
    // the end of its range with the larger n1/c_p + p1/c_n; smallest with both σ at their maxima and n1 at
    // n_i sqrt(c_p/c_n) clamped to the range. Checked against a dense scan of the level energy for every library
    // defect with a spread, both conductivity types and low to high injection.
    @Test
    void boundsAreTheExtremesOverTheWholeSpread() {
        Silicon si = Silicon.at(300);
        int checked = 0;
        for (Defect d : DefectLibrary.all()) {
            ParameterSpread s = d.spread();
            if (s == null || !d.hasAbsoluteCrossSections()) {
                continue;
            }
            for (Doping doping : new Doping[] {Doping.pType(1e16), Doping.nType(5e15), Doping.pType(1e13)}) {
                SrhBounds b = SrhBounds.of(d, doping, si);
                for (double dn : new double[] {1e12, 1e15, 1e17}) {
                    double kUpper = b.upper().lifetimeDensityProductSCm3(dn);
                    double kLower = b.lower().lifetimeDensityProductSCm3(dn);
                    double scanMax = 0;
                    double scanMin = Double.POSITIVE_INFINITY;
                    for (int i = 0; i <= 200; i++) {
                        double e = s.energyEv().min() + (s.energyEv().max() - s.energyEv().min()) * i / 200;
                        Defect worst = d.withParameters(e, s.electronCrossSectionCm2().min(),
                                s.holeCrossSectionCm2().min());
                        Defect best = d.withParameters(e, s.electronCrossSectionCm2().max(),
                                s.holeCrossSectionCm2().max());
                        scanMax = Math.max(scanMax, SrhRecombination.of(worst, doping, si)
                                .lifetimeDensityProductSCm3(dn));
                        scanMin = Math.min(scanMin, SrhRecombination.of(best, doping, si)
                                .lifetimeDensityProductSCm3(dn));
                    }
                    String what = d.id() + " " + doping + " dn " + dn;
                    assertThat(kUpper).as(what).isGreaterThanOrEqualTo(scanMax * (1 - 1e-12));
                    assertThat(kUpper).as(what + ": the maximum lies at an end of the range")
                            .isCloseTo(scanMax, within(1e-9 * scanMax));
                    assertThat(kLower).as(what).isLessThanOrEqualTo(scanMin * (1 + 1e-12));
                    assertThat(kLower).as(what).isCloseTo(scanMin, within(2e-3 * scanMin));
                    checked++;
                }
            }
        }
        assertThat(checked).isGreaterThan(20);
    }

    // The same claim for levels whose published energy spread reaches close to a band edge, where one end of the
    // range gives a huge p1 (near E_v) or n1 (near E_c) and the other a small one: the upper bound must take the
    // end with the larger n1/c_p + p1/c_n, whichever side it lies on.
    @Test
    void upperBoundTakesTheWorseEndOfAWideEnergySpread() {
        Silicon si = Silicon.at(300);
        for (TrapLevel level : new TrapLevel[] {TrapLevel.aboveValenceBand(0.3), TrapLevel.belowConductionBand(0.3)}) {
            ParameterSpread spread = new ParameterSpread(new Range(0.05, 0.6), new Range(1e-15, 1e-14),
                    new Range(1e-16, 1e-14), "wide, for the test");
            Defect d = Defect.of("wide", "wide", level, 3e-15, 1e-15, si.velocityModel(), "test", spread);
            for (Doping doping : new Doping[] {Doping.pType(1e13), Doping.nType(1e13), Doping.pType(1e16)}) {
                SrhBounds b = SrhBounds.of(d, doping, si);
                for (double dn : new double[] {1e11, 1e14}) {
                    double scanMax = 0;
                    for (int i = 0; i <= 400; i++) {
                        double e = 0.05 + 0.55 * i / 400;
                        scanMax = Math.max(scanMax, SrhRecombination.of(d.withParameters(e, 1e-15, 1e-16), doping, si)
                                .lifetimeDensityProductSCm3(dn));
                    }
                    assertThat(b.upper().lifetimeDensityProductSCm3(dn)).as(level + " " + doping + " dn " + dn)
                            .isCloseTo(scanMax, within(1e-9 * scanMax));
                }
            }
        }
    }

    // The exact emission densities of the bounds keep n1 p1 = n_i² (Shockley & Read 1952, eq. for n1, p1).
    @Test
    void boundEmissionDensitiesKeepMassAction() {
        Silicon si = Silicon.at(300);
        double ni2 = si.intrinsicPerCm3() * si.intrinsicPerCm3();
        for (Defect d : DefectLibrary.all()) {
            if (!d.hasAbsoluteCrossSections()) {
                continue;
            }
            SrhBounds b = SrhBounds.of(d, Doping.pType(1e16), si);
            assertThat(b.upper().n1PerCm3() * b.upper().p1PerCm3()).as(d.id()).isCloseTo(ni2, within(1e-9 * ni2));
            assertThat(b.lower().n1PerCm3() * b.lower().p1PerCm3()).as(d.id()).isCloseTo(ni2, within(1e-9 * ni2));
        }
    }

    // IntrinsicLifetime.Power (class comment): x^a to about 4 ulp, over normal doubles, for the exponents the
    // models use (0.92 Auger, 0.54 radiative screening) and any other in (0, 1).
    @Test
    void fastPowerAgreesWithMathPowToAFewUlp() {
        for (double a : new double[] {0.92, 0.54, 0.5, 0.1, 0.99}) {
            IntrinsicLifetime.Power p = new IntrinsicLifetime.Power(a);
            double x = 1.0e-300;
            while (x < 1e300) {
                double expected = Math.pow(x, a);
                assertThat(p.of(x)).as("%s^%s", x, a).isCloseTo(expected, within(8 * Math.ulp(expected)));
                x *= 1.0123456789;
                if (x > 1e-280 && x < 1e280) {
                    x *= 7.77;
                }
            }
            assertThat(p.of(Double.MIN_NORMAL)).isCloseTo(Math.pow(Double.MIN_NORMAL, a),
                    within(8 * Math.ulp(Math.pow(Double.MIN_NORMAL, a))));
            assertThat(p.of(0)).isEqualTo(0.0);
            assertThat(p.of(Double.POSITIVE_INFINITY)).isInfinite();
        }
    }

    // The surface model chosen is the one used: the exact fundamental mode (Sproul, JAP 76, 2851 (1994), eq. 1)
    // and Sproul's approximation (eq. 2) differ by several per cent at S = 1e4 cm/s on 180 µm.
    @Test
    void lifetimeUsesTheChosenSurfaceModel() {
        double w = 0.018;
        double s = 1e4;
        double d = 28.6;
        assertThat(SurfaceLifetime.lifetimeS(SurfaceModel.EXACT, w, s, d)).isEqualTo(SurfaceLifetime.exactS(w, s, d));
        assertThat(SurfaceLifetime.lifetimeS(SurfaceModel.SPROUL, w, s, d))
                .isEqualTo(SurfaceLifetime.sproulS(w, s, d));
        assertThat(Math.abs(SurfaceLifetime.exactS(w, s, d) / SurfaceLifetime.sproulS(w, s, d) - 1))
                .isGreaterThan(0.01);
    }
}
