package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.material.KlaassenMobility;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.IntrinsicLifetime;
import trapmap.physics.recombination.RadiativeCoefficient;
import trapmap.physics.recombination.SrhBounds;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.physics.recombination.SurfaceLifetime;

/**
 * The optimised intrinsic rate and conversion kernel against direct transcriptions of the formulas
 * ({@link ReferenceFormulas}): they must agree to 1e-12 relative (scaled by the condition number where the SRH
 * rate is a difference of nearly equal rates).
 */
class ReferenceAccuracyTest {
    private static final double TOL = 1e-12;

    static Stream<Arguments> wafers() {
        List<Arguments> list = new ArrayList<>();
        Doping[] dopings = {Doping.pType(1e10), Doping.pType(1e14), Doping.pType(1e16), Doping.pType(2e18),
            Doping.nType(1e15), Doping.nType(5e16), Doping.nType(1e19)};
        double[] temperatures = {77, 200, 300, 350, 420, 500};
        for (Doping d : dopings) {
            for (double t : temperatures) {
                list.add(Arguments.of(d, t));
            }
        }
        return list.stream();
    }

    /** Δn from 1e8 to 1e19 cm^-3: eight points per decade plus seeded log-uniform values. */
    static double[] injections() {
        double[] grid = new double[88 + 1 + 200];
        for (int k = 0; k <= 88; k++) {
            grid[k] = Math.pow(10, 8 + k / 8.0);
        }
        SplittableRandom rnd = new SplittableRandom(7);
        for (int k = 89; k < grid.length; k++) {
            grid[k] = Math.pow(10, 8 + 11 * rnd.nextDouble());
        }
        return grid;
    }

    @ParameterizedTest(name = "{0} at {1} K")
    @MethodSource("wafers")
    void intrinsicRateMatchesRichter2012(Doping doping, double temperatureK) {
        Silicon si = Silicon.at(temperatureK);
        for (double bLow : new double[] {RadiativeCoefficient.TRUPKE_2003_CM3_PER_S, 2e-14}) {
            IntrinsicLifetime model = IntrinsicLifetime.richter2012(doping, si, bLow);
            for (double dn : injections()) {
                double expected = ReferenceFormulas.intrinsicRatePerS(doping, si, bLow, dn);
                assertThat(relativeDifference(model.rateConstantPerS(dn), expected))
                        .as("1/tau_intr at dn=%s", dn).isLessThanOrEqualTo(TOL);
                assertThat(relativeDifference(model.lifetimeS(dn), 1 / expected))
                        .as("tau_intr at dn=%s", dn).isLessThanOrEqualTo(TOL);
            }
        }
    }

    @ParameterizedTest(name = "n+p = {0}")
    @MethodSource("carrierSums")
    void radiativeRelativeMatchesAltermatt2005(double np) {
        for (double t : new double[] {77, 250, 300, 365, 500}) {
            assertThat(relativeDifference(RadiativeCoefficient.relative(np, t),
                    ReferenceFormulas.radiativeRelative(np, t))).as("B_rel at T=%s", t).isLessThanOrEqualTo(TOL);
        }
    }

    static Stream<Double> carrierSums() {
        return Stream.of(1e8, 3e13, 1e15, 2e16, 7e17, 1e18, 4.5e18, 1e19, 2e19, 1e20);
    }

    @Test
    void convertedPixelsMatchTheDirectFormulas() {
        Defect feI = DefectLibrary.byId("fe-i");
        Defect midgap = DefectLibrary.byId("midgap");
        SplittableRandom rnd = new SplittableRandom(11);
        for (Injection inj : new Injection[] {Injection.fixed(1e14), Injection.fixed(3e16), Injection.generation(1e19),
            Injection.generation(3e21)}) {
            for (Doping doping : new Doping[] {Doping.pType(1e16), Doping.nType(2e15), Doping.pType(1e18)}) {
                for (double t : new double[] {300, 350}) {
                    for (Defect defect : new Defect[] {feI, midgap}) {
                        Conditions c = Conditions.of(doping, inj).withSilicon(Silicon.at(t))
                                .withSurface(Surface.sproul(180, 10)).withReferenceInjection(1e15);
                        TrapDensityConverter conv = new TrapDensityConverter(c, defect);
                        for (int k = 0; k < 300; k++) {
                            double tauUs = Math.pow(10, -1 + 5 * rnd.nextDouble());
                            checkPixel(conv, c, defect, tauUs);
                        }
                    }
                }
            }
        }
    }

    private static void checkPixel(TrapDensityConverter conv, Conditions c, Defect defect, double tauUs) {
        Doping doping = c.doping();
        Silicon si = c.silicon();
        SrhRecombination srh = SrhRecombination.of(defect, doping, si);
        SrhBounds bounds = SrhBounds.of(defect, doping, si);
        double d = KlaassenMobility.minorityDiffusivityCm2PerS(doping, si);
        double surfaceRate = 1 / SurfaceLifetime.lifetimeS(c.surface().model(), c.surface().thicknessUm() * 1e-4,
                c.surface().srvCmPerS(), d);
        double tauS = tauUs * 1e-6;
        double dn = c.injection() instanceof Injection.Fixed f ? f.excessPerCm3()
                : ((Injection.Generation) c.injection()).ratePerCm3PerS() * tauS;
        double intrinsicRate = ReferenceFormulas.intrinsicRatePerS(doping, si, c.radiativeCm3PerS(), dn);
        double srhRate = 1 / tauS - intrinsicRate - surfaceRate;
        // Relative errors of the rates are amplified by the cancellation in the SRH rate.
        double cond = Math.max(1, (1 / tauS + intrinsicRate + surfaceRate) / Math.abs(srhRate));
        // below the resolution δ·(1/τ_intr + 1/τ_surf) the pixel is BELOW_LIMIT and reports that rate's density
        double detectable = c.detectionResolution() * (intrinsicRate + surfaceRate);
        boolean ok = srhRate >= detectable;
        double rate = ok ? srhRate : detectable;
        double ref = c.referenceInjectionPerCm3();
        double nt = ReferenceFormulas.lifetimeDensityProduct(srh, dn) * rate;
        double refRate = (ok ? nt / ReferenceFormulas.lifetimeDensityProduct(srh, ref) : 0)
                + ReferenceFormulas.intrinsicRatePerS(doping, si, c.radiativeCm3PerS(), ref) + surfaceRate;

        PixelResult r = conv.convert(tauUs);
        String at = "tau=" + tauUs + " us, " + c.injection() + ", " + doping + ", " + defect.id();
        assertThat(r.status()).as(at).isEqualTo(ok ? PixelStatus.OK : PixelStatus.BELOW_LIMIT);
        assertThat(relativeDifference(r.injectionPerCm3(), dn)).as(at).isLessThanOrEqualTo(TOL);
        assertThat(relativeDifference(r.intrinsicLifetimeUs(), 1e6 / intrinsicRate)).as(at)
                .isLessThanOrEqualTo(TOL);
        assertThat(relativeDifference(r.occupancy(), ReferenceFormulas.occupancy(srh, dn))).as(at)
                .isLessThanOrEqualTo(TOL);
        assertThat(relativeDifference(r.trapDensityPerCm3(), nt)).as(at).isLessThanOrEqualTo(TOL * cond);
        assertThat(relativeDifference(r.trapDensityMinPerCm3(),
                ReferenceFormulas.lifetimeDensityProduct(bounds.lower(), dn) * rate)).as(at)
                .isLessThanOrEqualTo(TOL * cond);
        assertThat(relativeDifference(r.trapDensityMaxPerCm3(),
                ReferenceFormulas.lifetimeDensityProduct(bounds.upper(), dn) * rate)).as(at)
                .isLessThanOrEqualTo(TOL * cond);
        if (ok) {
            assertThat(relativeDifference(r.srhLifetimeUs(), 1e6 / srhRate)).as(at).isLessThanOrEqualTo(TOL * cond);
        } else {
            assertThat(r.srhLifetimeUs()).as(at).isEqualTo(Double.POSITIVE_INFINITY);
        }
        assertThat(relativeDifference(r.lifetimeAtReferenceUs(), 1e6 / refRate)).as(at)
                .isLessThanOrEqualTo(TOL * cond);
    }

    private static double relativeDifference(double actual, double expected) {
        if (actual == expected) {
            return 0;
        }
        return Math.abs(actual - expected) / Math.abs(expected);
    }
}
