package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.material.KlaassenMobility;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.IntrinsicLifetime;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.physics.recombination.SurfaceLifetime;
import trapmap.physics.recombination.SurfaceModel;
import trapmap.shared.units.Units;

/**
 * The array kernel, asked for the trap density and status alone (what the command line, statistics and inspection
 * ask for) and for all planes, against the straightforward per-pixel formula written here step by step
 * (1/τ_intr by {@link IntrinsicLifetime#rateConstantPerS}, K = (a + b·Δn)/(n0 + p0 + Δn) with one division, the
 * surface rate from {@link SurfaceLifetime}):
 * <pre>
 * Δn = fixed or G·τ;  r = 1/τ − 1/τ_intr(Δn) − 1/τ_surf;  r_min = δ·(1/τ_intr + 1/τ_surf)
 * OK when r ≥ r_min, else BELOW_LIMIT with r_min;  N_t = K(Δn)·r
 * </pre>
 * over every library defect with absolute cross-sections, both doping types at 1e10–1e19 cm^-3, 200–500 K, fixed
 * injection 1e6–1e19 cm^-3 and generation 1e10–1e24 cm^-3 s^-1, ideal and real surfaces, lifetimes of 1 ns–1 s
 * and beyond, and the special samples. Asserted: the worst relative difference of N_t (float) is below 1e-6 (the
 * project's rule), at least 99.9 % of the pixels are bit-identical (measured: all 239 200), and statuses agree
 * except where r lies within 1e-12 of r_min (almost none). A faster kernel must keep this test as it is.
 *
 * <p>This is a consistency check of the kernel against the model, not a check of the model: K is the SRH
 * steady-state relation (Shockley and Read, Phys. Rev. 87, 835 (1952); Hall, Phys. Rev. 87, 387 (1952)) solved for
 * N_t, and τ_intr the Richter et al. 2012 parameterisation (Phys. Rev. B 86, 165202); their published check values
 * are asserted by the tests of {@link IntrinsicLifetime} and of the SRH lifetime.
 */
class KernelFormulaTest {

    @Test
    void densityAndAllPlanesMatchThePerPixelFormula() {
        SplittableRandom rnd = new SplittableRandom(5_12_2026L);
        double worst = 0;
        long compared = 0;
        long identical = 0;
        long nearBoundary = 0;
        for (Defect defect : DefectLibrary.all()) {
            if (!defect.hasAbsoluteCrossSections()) {
                continue;
            }
            for (int wafer = 0; wafer < 8; wafer++) {
                double dop = Math.pow(10, 10 + 9 * rnd.nextDouble());
                Doping doping = rnd.nextBoolean() ? Doping.pType(dop) : Doping.nType(dop);
                Silicon si = Silicon.at(wafer % 4 == 0 ? 300 : 200 + 300 * rnd.nextDouble());
                Injection inj = wafer % 2 == 0 ? Injection.generation(Math.pow(10, 10 + 14 * rnd.nextDouble()))
                        : Injection.fixed(Math.pow(10, 6 + 13 * rnd.nextDouble()));
                Conditions c = Conditions.of(doping, inj).withSilicon(si);
                if (rnd.nextBoolean()) {
                    c = c.withSurface(new Surface(100 + 200 * rnd.nextDouble(), Math.pow(10, 4 * rnd.nextDouble()),
                            rnd.nextBoolean() ? SurfaceModel.SPROUL : SurfaceModel.EXACT));
                }
                TrapDensityConverter conv = new TrapDensityConverter(c, defect);
                float[] tau = lifetimes(rnd, 1500);
                ConversionOutput density = new ConversionOutput(new float[tau.length], null, null, null, null, null,
                        null, new byte[tau.length], null);
                ConversionOutput all = ConversionOutput.allocateAll(tau.length);
                conv.convert(tau, 100, density, 1);
                conv.convert(tau, 100, all, 2);
                for (int i = 0; i < tau.length; i++) {
                    double[] ref = reference(c, defect, tau[i]);
                    if (ref == null) {
                        assertThat(density.trapDensity[i]).isNaN();
                        assertThat(all.trapDensity[i]).isNaN();
                        continue;
                    }
                    String at = defect.id() + " " + c + " tau=" + tau[i] + " us";
                    if (ref[2] > 0) {
                        nearBoundary++;
                    } else {
                        byte status = (ref[1] > 0 ? PixelStatus.OK : PixelStatus.BELOW_LIMIT).code();
                        assertThat(density.status[i]).as(at).isEqualTo(status);
                        assertThat(all.status[i]).as(at).isEqualTo(status);
                    }
                    float expected = (float) ref[0];
                    for (float got : new float[] {density.trapDensity[i], all.trapDensity[i]}) {
                        compared++;
                        if (Float.floatToIntBits(got) == Float.floatToIntBits(expected)) {
                            identical++;
                            continue;
                        }
                        worst = Math.max(worst, Math.abs(got - ref[0]) / Math.abs(ref[0]));
                    }
                }
            }
        }
        assertThat(compared).isGreaterThan(100_000);
        assertThat(worst).as("worst relative difference of N_t").isLessThan(1e-6);
        assertThat((double) identical / compared).as("bit-identical fraction").isGreaterThan(0.999);
        assertThat(nearBoundary).isLessThan(compared / 10_000 + 1);
    }

    /** Log-uniform 1 ns–1 s, and 1 s–1e6 s for 1 %, with NaN, non-positive, infinite and below-floor samples. */
    private static float[] lifetimes(SplittableRandom rnd, int n) {
        float[] tau = new float[n];
        for (int i = 0; i < n; i++) {
            tau[i] = (float) Math.pow(10, i % 100 == 0 ? 6 + 6 * rnd.nextDouble() : -3 + 9 * rnd.nextDouble());
        }
        float[] special = {Float.NaN, 0f, -3f, Float.POSITIVE_INFINITY, 5e-4f, Float.MAX_VALUE, 1e-3f};
        for (float s : special) {
            tau[rnd.nextInt(n)] = s;
        }
        return tau;
    }

    /**
     * {N_t, 1 if OK, 1 if r lies within 1e-12 of r_min} of one pixel by the per-pixel formula, or null for a sample
     * the kernel does not convert.
     */
    private static double[] reference(Conditions c, Defect defect, float tauF) {
        double tauUs = tauF;
        if (!(tauUs >= TrapDensityConverter.LIFETIME_FLOOR_US) || Double.isInfinite(tauUs)) {
            return null;
        }
        IntrinsicLifetime intrinsic = IntrinsicLifetime.richter2012(c.doping(), c.silicon(), c.radiativeCm3PerS());
        SrhRecombination srh = SrhRecombination.of(defect, c.doping(), c.silicon());
        double surface = 0;
        if (!c.surface().ideal()) {
            double d = KlaassenMobility.minorityDiffusivityCm2PerS(c.doping(), c.silicon());
            surface = 1.0 / SurfaceLifetime.lifetimeS(c.surface().model(),
                    c.surface().thicknessUm() * Units.CM_PER_UM, c.surface().srvCmPerS(), d);
        }
        double tauS = tauUs * Units.S_PER_US;
        double dn = c.injection() instanceof Injection.Fixed f ? f.excessPerCm3()
                : ((Injection.Generation) c.injection()).ratePerCm3PerS() * tauS;
        double cn = srh.electronCaptureCm3PerS();
        double cp = srh.holeCaptureCm3PerS();
        double ka = (srh.n0PerCm3() + srh.n1PerCm3()) / cp + (srh.p0PerCm3() + srh.p1PerCm3()) / cn;
        double kb = 1.0 / cp + 1.0 / cn;
        double k = (ka + kb * dn) * (1.0 / (srh.n0PerCm3() + srh.p0PerCm3() + dn));
        double intrinsicRate = intrinsic.rateConstantPerS(dn);
        double srhRate = 1.0 / tauS - intrinsicRate - surface;
        double minRate = c.detectionResolution() * (intrinsicRate + surface);
        boolean ok = srhRate >= minRate;
        boolean near = Math.abs(srhRate - minRate) <= 1e-12 * (1.0 / tauS);
        return new double[] {k * (ok ? srhRate : minRate), ok ? 1 : 0, near ? 1 : 0};
    }
}
