package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SrhBounds;
import trapmap.physics.recombination.SrhRecombination;

/**
 * The array kernel ({@link TrapDensityConverter#convert(float[], int, ConversionOutput, int)}) against a plain
 * transcription of the conversion's equations, pixel by pixel, for every output plane, status, warning bit and the
 * counts of its {@link TrapDensityConverter.Tally}:
 * <pre>
 * Δn = fixed or G·τ_eff;  r_SRH = 1/τ_eff − 1/τ_intr(Δn) − 1/τ_surf;  r_min = δ·(1/τ_intr + 1/τ_surf)
 * OK when r_SRH ≥ r_min, else BELOW_LIMIT with r_SRH replaced by r_min;  N_t = K(Δn)·r  (min/max: K of the bounds)
 * τ_SRH = 1/r_SRH (∞ when below),  f_t of Shockley–Read–Hall,  τ_ref = 1/(N_t/K(Δn_ref)·[OK] + 1/τ_intr(Δn_ref) + 1/τ_surf)
 * </pre>
 * The intrinsic rate is {@link ReferenceFormulas#intrinsicRatePerS} (Richter 2012 written literally, the carrier
 * factor in decimal arithmetic), K and f_t are {@link ReferenceFormulas}' literal forms; only the surface lifetime
 * (one number per wafer) and the bound parameter sets ({@link SrhBounds}, tested on their own) come from the main
 * code. Tolerance: 1e-6 relative on every value (the array planes are floats, rounded at 6e-8; the rearranged forms
 * of the kernel agree with the literal ones to about 1e-14). Pixels whose status or a warning's condition lies within
 * 1e-9 of its boundary are left out of the status and warning comparison, since there the two forms may round to
 * either side; the test requires that almost none are.
 */
class KernelReferenceTest {
    private static final double TOLERANCE = 1e-6;
    private static final double BOUNDARY = 1e-9;

    /** Random wafers, conditions and lifetimes: both doping types, both injection modes, surfaces, temperatures. */
    @Test
    void arrayKernelMatchesReferenceEquations() {
        SplittableRandom rnd = new SplittableRandom(20261204L);
        List<Defect> defects = new ArrayList<>();
        for (Defect d : DefectLibrary.all()) {
            if (d.hasAbsoluteCrossSections()) {
                defects.add(d);
            }
        }
        assertThat(defects).hasSizeGreaterThan(3);
        int compared = 0;
        int nearBoundary = 0;
        int[] statusSeen = new int[PixelStatus.values().length];
        int warningBitsSeen = 0;
        for (int wafer = 0; wafer < 240; wafer++) {
            Case c = randomCase(rnd, defects.get(wafer % defects.size()));
            float[] tau = lifetimes(rnd, 199);
            ConversionOutput out = ConversionOutput.allocateAll(tau.length);
            TrapDensityConverter conv = new TrapDensityConverter(c.conditions, c.defect);
            TrapDensityConverter.Tally tally = conv.convert(tau, tau.length, out, 1);
            int[] counts = new int[PixelStatus.values().length];
            int[] warned = new int[8];
            for (int i = 0; i < tau.length; i++) {
                String at = c + ", tau=" + tau[i] + " us";
                counts[out.status[i]]++;
                for (int b = 0; b < 8; b++) {
                    warned[b] += (out.warnings[i] >> b) & 1;
                }
                Expected e = expected(c, conv, tau[i]);
                if (e.nearBoundary) {
                    nearBoundary++;
                    continue;
                }
                compared++;
                statusSeen[e.status.code()]++;
                warningBitsSeen |= e.warnings;
                assertThat(out.status[i]).as(at).isEqualTo(e.status.code());
                assertThat(out.warnings[i] & 0xFF).as(at + " warnings").isEqualTo(e.warnings);
                close(out.trapDensity[i], e.nt, at + " N_t");
                close(out.trapDensityMin[i], e.ntMin, at + " N_t,min");
                close(out.trapDensityMax[i], e.ntMax, at + " N_t,max");
                close(out.occupancy[i], e.occupancy, at + " f_t");
                close(out.srhLifetimeUs[i], e.srhUs, at + " tau_SRH");
                close(out.injection[i], e.dn, at + " dn");
                close(out.lifetimeAtReferenceUs[i], e.refUs, at + " tau_ref");
            }
            assertThat(tally.statusCounts()).as(c + " status counts").isEqualTo(counts);
            assertThat(tally.warningPixels()).as(c + " warning counts").isEqualTo(warned);
        }
        assertThat(nearBoundary).isLessThan(compared / 1000 + 1);
        assertThat(statusSeen[PixelStatus.OK.code()]).isPositive();
        assertThat(statusSeen[PixelStatus.BELOW_LIMIT.code()]).isPositive();
        assertThat(statusSeen[PixelStatus.INVALID.code()]).isPositive();
        assertThat(statusSeen[PixelStatus.NO_DATA.code()]).isPositive();
        for (ConversionWarning w : List.of(ConversionWarning.TRAP_DENSITY_NOT_SMALL, ConversionWarning.SURFACE_LIMITED,
                ConversionWarning.TEMPERATURE_NOT_300K, ConversionWarning.VELOCITY_CONVENTION,
                ConversionWarning.SURFACE_LOW_INJECTION_DIFFUSIVITY)) {
            assertThat(warningBitsSeen & w.bit()).as(w + " exercised").isNotZero();
        }
    }

    private record Case(Conditions conditions, Defect defect) {
        @Override
        public String toString() {
            return defect.id() + " " + conditions;
        }
    }

    private static Case randomCase(SplittableRandom rnd, Defect defect) {
        double dop = Math.pow(10, 14 + 3 * rnd.nextDouble());
        Doping doping = rnd.nextBoolean() ? Doping.pType(dop) : Doping.nType(dop);
        Injection inj = rnd.nextBoolean() ? Injection.fixed(Math.pow(10, 12 + 5 * rnd.nextDouble()))
                : Injection.generation(Math.pow(10, 17 + 4 * rnd.nextDouble()));
        double t = rnd.nextInt(3) == 0 ? 300 : 250 + 150 * rnd.nextDouble();
        Silicon si = Silicon.at(t, rnd.nextBoolean() ? ThermalVelocityModel.FIXED : ThermalVelocityModel.GREEN_1990);
        Conditions c = Conditions.of(doping, inj).withSilicon(si);
        if (rnd.nextInt(3) > 0) {
            c = c.withSurface(new Surface(100 + 200 * rnd.nextDouble(), Math.pow(10, 3 * rnd.nextDouble()),
                    rnd.nextBoolean() ? trapmap.physics.recombination.SurfaceModel.SPROUL
                            : trapmap.physics.recombination.SurfaceModel.EXACT));
        }
        if (rnd.nextBoolean()) {
            c = c.withReferenceInjection(Math.pow(10, 13 + 3 * rnd.nextDouble()));
        }
        if (rnd.nextInt(4) == 0) {
            c = c.withDetectionResolution(0.01 + 0.2 * rnd.nextDouble());
        }
        return new Case(c, defect);
    }

    /** Log-uniform 0.01 µs–100 ms, with NaN, non-positive, infinite and below-floor samples among them. */
    private static float[] lifetimes(SplittableRandom rnd, int n) {
        float[] tau = new float[n];
        for (int i = 0; i < n; i++) {
            tau[i] = (float) Math.pow(10, -2 + 7 * rnd.nextDouble());
        }
        float[] special = {Float.NaN, 0f, -3f, Float.POSITIVE_INFINITY, 5e-4f, 2e-9f};
        for (float s : special) {
            tau[rnd.nextInt(n)] = s;
        }
        return tau;
    }

    private record Expected(PixelStatus status, int warnings, double dn, double nt, double ntMin, double ntMax,
                            double occupancy, double srhUs, double refUs, boolean nearBoundary) {
    }

    private static Expected expected(Case c, TrapDensityConverter conv, float tauF) {
        double nan = Double.NaN;
        if (Float.isNaN(tauF)) {
            return new Expected(PixelStatus.NO_DATA, 0, nan, nan, nan, nan, nan, nan, nan, false);
        }
        double tauUs = tauF;
        if (!(tauUs >= 1e-3) || Double.isInfinite(tauUs)) {
            return new Expected(PixelStatus.INVALID, 0, nan, nan, nan, nan, nan, nan, nan, false);
        }
        Conditions k = c.conditions;
        double tauS = tauUs * 1e-6;
        double dn = k.injection() instanceof Injection.Fixed f ? f.excessPerCm3()
                : ((Injection.Generation) k.injection()).ratePerCm3PerS() * tauS;
        double intrinsic = ReferenceFormulas.intrinsicRatePerS(k.doping(), k.silicon(), k.radiativeCm3PerS(), dn);
        double surfaceUs = conv.surfaceLifetimeUs();
        double surface = 1 / (surfaceUs * 1e-6);
        double srhRate = 1 / tauS - intrinsic - surface;
        double minRate = k.detectionResolution() * (intrinsic + surface);
        boolean ok = srhRate >= minRate;
        boolean near = Math.abs(srhRate - minRate) <= BOUNDARY * (intrinsic + surface + 1 / tauS);
        double rate = ok ? srhRate : minRate;
        SrhRecombination srh = SrhRecombination.of(c.defect, k.doping(), k.silicon());
        SrhBounds bounds = SrhBounds.of(c.defect, k.doping(), k.silicon());
        double nt = ReferenceFormulas.lifetimeDensityProduct(srh, dn) * rate;
        double dop = k.doping().densityPerCm3();
        int w = 0;
        double smallLimit = 0.1 * Math.min(dn, dop);
        if (ok && nt > smallLimit) {
            w |= ConversionWarning.TRAP_DENSITY_NOT_SMALL.bit();
        }
        near |= ok && Math.abs(nt - smallLimit) <= BOUNDARY * smallLimit;
        if (!k.surface().ideal()) {
            if (tauUs / surfaceUs > 0.5) {
                w |= ConversionWarning.SURFACE_LIMITED.bit();
            }
            near |= Math.abs(tauUs / surfaceUs - 0.5) <= BOUNDARY;
            if (dn > 0.1 * dop) {
                w |= ConversionWarning.SURFACE_LOW_INJECTION_DIFFUSIVITY.bit();
            }
            near |= Math.abs(dn - 0.1 * dop) <= BOUNDARY * dop;
        }
        if (Math.abs(k.silicon().temperatureK() - 300) > 3) {
            w |= ConversionWarning.TEMPERATURE_NOT_300K.bit();
        }
        if (k.silicon().velocityModel() != c.defect.velocityConvention()) {
            w |= ConversionWarning.VELOCITY_CONVENTION.bit();
        }
        double ref = k.referenceInjectionPerCm3();
        double refUs = nan;
        if (!Double.isNaN(ref)) {
            double refSrh = ok ? nt / ReferenceFormulas.lifetimeDensityProduct(srh, ref) : 0;
            refUs = 1e6 / (refSrh + ReferenceFormulas.intrinsicRatePerS(k.doping(), k.silicon(),
                    k.radiativeCm3PerS(), ref) + surface);
        }
        return new Expected(ok ? PixelStatus.OK : PixelStatus.BELOW_LIMIT, w, dn, nt,
                ReferenceFormulas.lifetimeDensityProduct(bounds.lower(), dn) * rate,
                ReferenceFormulas.lifetimeDensityProduct(bounds.upper(), dn) * rate,
                ReferenceFormulas.occupancy(srh, dn), ok ? 1e6 / srhRate : Double.POSITIVE_INFINITY, refUs, near);
    }

    private static void close(float actual, double expected, String what) {
        if (Double.isNaN(expected)) {
            assertThat(actual).as(what).isNaN();
            return;
        }
        if (Double.isInfinite(expected)) {
            assertThat((double) actual).as(what).isEqualTo(expected);
            return;
        }
        assertThat(Math.abs(actual - expected)).as(what + ": " + actual + " vs " + expected)
                .isLessThanOrEqualTo(TOLERANCE * Math.abs(expected));
    }
}
