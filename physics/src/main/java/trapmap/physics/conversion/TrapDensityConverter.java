package trapmap.physics.conversion;

import java.util.concurrent.ForkJoinPool;
import java.util.stream.IntStream;
import trapmap.physics.defect.Defect;
import trapmap.physics.material.KlaassenMobility;
import trapmap.physics.recombination.IntrinsicLifetime;
import trapmap.physics.recombination.SrhBounds;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.physics.recombination.SurfaceLifetime;
import trapmap.shared.check.Checks;
import trapmap.shared.units.Units;

/**
 * Converts effective lifetimes into the equivalent density of one defect, pixel by pixel:
 * <pre>
 * Δn = fixed, or G·τ_eff
 * 1/τ_SRH = 1/τ_eff − 1/τ_intr(Δn) − 1/τ_surf
 * N_t = K(Δn)/τ_SRH   (exact SRH inverse, see {@link SrhRecombination})
 * </pre>
 * The surface term uses the low-injection minority-carrier diffusivity of Klaassen's mobility at the wafer's doping,
 * so it is one number per wafer. When 1/τ_SRH ≤ 0 the pixel is {@link PixelStatus#BELOW_LIMIT} and the reported
 * density is the detection limit: the density whose SRH rate δ·(1/τ_intr + 1/τ_surf) would lower the lifetime that
 * intrinsic and surface recombination alone allow by the relative resolution δ.
 * <p>
 * Everything that depends only on the wafer is computed once in the constructor; a pixel then costs a few
 * arithmetic operations (fixed injection) or three powers (fixed generation). The single-pixel and array paths run
 * the same kernel, so their results agree exactly (array results are the single-pixel values rounded to float).
 * Immutable and thread-safe.
 */
public final class TrapDensityConverter {
    private static final int STATUS = 0;
    private static final int DN = 1;
    private static final int TAU_INTR = 2;
    private static final int TAU_SRH = 3;
    private static final int NT = 4;
    private static final int NT_MIN = 5;
    private static final int NT_MAX = 6;
    private static final int FT = 7;
    private static final int TAU_REF = 8;
    private static final int WARN = 9;
    private static final int SLOTS = 10;

    private final Conditions conditions;
    private final Defect defect;
    private final IntrinsicLifetime intrinsic;
    private final SrhRecombination srh;
    private final SrhBounds bounds;
    /** 1/τ_surf, 1/s (0 for ideal surfaces). */
    private final double surfaceRatePerS;
    private final boolean fixedInjection;
    /** Δn for fixed injection, or G (cm^-3 s^-1) for fixed generation. */
    private final double injectionParameter;
    private final double trapDensityLimitFactor;
    private final int baseWarnings;
    // Per-wafer values at the fixed injection (unused for fixed generation).
    private final double fixedIntrinsicRate;
    private final double fixedK;
    private final double fixedKMin;
    private final double fixedKMax;
    private final double fixedOccupancy;
    // Reference injection for harmonised lifetimes.
    private final boolean hasReference;
    private final double referenceIntrinsicRate;
    private final double referenceK;

    /**
     * @throws trapmap.shared.error.InvalidValueException when the defect has no absolute cross-sections
     */
    public TrapDensityConverter(Conditions conditions, Defect defect) {
        this.conditions = Checks.notNull(conditions, "conditions");
        this.defect = Checks.notNull(defect, "defect");
        defect.requireAbsoluteCrossSections();
        this.intrinsic = IntrinsicLifetime.richter2012(conditions.doping(), conditions.silicon(),
                conditions.radiativeCm3PerS());
        this.srh = SrhRecombination.of(defect, conditions.doping(), conditions.silicon());
        this.bounds = SrhBounds.of(defect, conditions.doping(), conditions.silicon());
        Surface surface = conditions.surface();
        if (surface.ideal()) {
            surfaceRatePerS = 0;
        } else {
            double d = KlaassenMobility.minorityDiffusivityCm2PerS(conditions.doping(), conditions.silicon());
            surfaceRatePerS = 1.0 / SurfaceLifetime.lifetimeS(surface.model(), surface.thicknessUm() * Units.CM_PER_UM,
                    surface.srvCmPerS(), d);
        }
        Injection inj = conditions.injection();
        fixedInjection = inj instanceof Injection.Fixed;
        injectionParameter = fixedInjection ? ((Injection.Fixed) inj).excessPerCm3()
                : ((Injection.Generation) inj).ratePerCm3PerS();
        trapDensityLimitFactor = 0.1;
        int warn = 0;
        if (intrinsic.outsideValidatedTemperature()) {
            warn |= ConversionWarning.TEMPERATURE_NOT_300K.bit();
        }
        if (conditions.silicon().velocityModel() != defect.velocityConvention()) {
            warn |= ConversionWarning.VELOCITY_CONVENTION.bit();
        }
        baseWarnings = warn;
        double dn = fixedInjection ? injectionParameter : Double.NaN;
        fixedIntrinsicRate = fixedInjection ? intrinsic.rateConstantPerS(dn) : Double.NaN;
        fixedK = fixedInjection ? srh.lifetimeDensityProductSCm3(dn) : Double.NaN;
        fixedKMin = fixedInjection ? bounds.lower().lifetimeDensityProductSCm3(dn) : Double.NaN;
        fixedKMax = fixedInjection ? bounds.upper().lifetimeDensityProductSCm3(dn) : Double.NaN;
        fixedOccupancy = fixedInjection ? srh.occupancy(dn) : Double.NaN;
        double ref = conditions.referenceInjectionPerCm3();
        hasReference = !Double.isNaN(ref);
        referenceIntrinsicRate = hasReference ? intrinsic.rateConstantPerS(ref) : Double.NaN;
        referenceK = hasReference ? srh.lifetimeDensityProductSCm3(ref) : Double.NaN;
    }

    /** Converts one pixel's effective lifetime (µs). */
    public PixelResult convert(double effectiveLifetimeUs) {
        double[] s = new double[SLOTS];
        evaluate(effectiveLifetimeUs, s);
        return new PixelResult(PixelStatus.ofCode((int) s[STATUS]), s[DN], effectiveLifetimeUs, s[TAU_INTR],
                surfaceLifetimeUs(), s[TAU_SRH], s[NT], s[NT_MIN], s[NT_MAX], s[FT], s[TAU_REF],
                ConversionWarning.fromMask((int) s[WARN]));
    }

    /** Converts a raster with all available processors. */
    public void convert(float[] effectiveLifetimeUs, int width, ConversionOutput out) {
        convert(effectiveLifetimeUs, width, out, Runtime.getRuntime().availableProcessors());
    }

    /**
     * Converts a row-major raster of effective lifetimes (µs; NaN = no data) in parallel over rows.
     *
     * @param width   raster width in pixels; the length must be a multiple of it
     * @param threads number of threads (1 runs on the calling thread)
     */
    public void convert(float[] effectiveLifetimeUs, int width, ConversionOutput out, int threads) {
        int n = effectiveLifetimeUs.length;
        if (width <= 0 || n % width != 0) {
            throw new IllegalArgumentException("raster of " + n + " pixels is not a whole number of rows of "
                    + width);
        }
        out.checkLength(n);
        int rows = n / width;
        if (threads <= 1 || rows < 2) {
            convertRows(effectiveLifetimeUs, width, out, 0, rows);
            return;
        }
        int blocks = Math.min(rows, threads * 16);
        ForkJoinPool pool = new ForkJoinPool(threads);
        try {
            pool.submit(() -> IntStream.range(0, blocks).parallel().forEach(b -> convertRows(effectiveLifetimeUs,
                    width, out, (int) ((long) rows * b / blocks), (int) ((long) rows * (b + 1) / blocks)))).join();
        } finally {
            pool.shutdown();
        }
    }

    private void convertRows(float[] tau, int width, ConversionOutput out, int rowFrom, int rowTo) {
        double[] s = new double[SLOTS];
        for (int i = rowFrom * width, end = rowTo * width; i < end; i++) {
            float t = tau[i];
            if (t != t) { // NaN: no data
                store(out, i, Float.NaN, PixelStatus.NO_DATA.code(), (byte) 0, null);
                continue;
            }
            evaluate(t, s);
            store(out, i, Float.NaN, (byte) s[STATUS], (byte) s[WARN], s);
        }
    }

    private static void store(ConversionOutput out, int i, float nan, byte status, byte warn, double[] s) {
        if (out.trapDensity != null) {
            out.trapDensity[i] = s == null ? nan : (float) s[NT];
        }
        if (out.trapDensityMin != null) {
            out.trapDensityMin[i] = s == null ? nan : (float) s[NT_MIN];
        }
        if (out.trapDensityMax != null) {
            out.trapDensityMax[i] = s == null ? nan : (float) s[NT_MAX];
        }
        if (out.occupancy != null) {
            out.occupancy[i] = s == null ? nan : (float) s[FT];
        }
        if (out.srhLifetimeUs != null) {
            out.srhLifetimeUs[i] = s == null ? nan : (float) s[TAU_SRH];
        }
        if (out.injection != null) {
            out.injection[i] = s == null ? nan : (float) s[DN];
        }
        if (out.lifetimeAtReferenceUs != null) {
            out.lifetimeAtReferenceUs[i] = s == null ? nan : (float) s[TAU_REF];
        }
        if (out.status != null) {
            out.status[i] = status;
        }
        if (out.warnings != null) {
            out.warnings[i] = warn;
        }
    }

    /** The kernel shared by both paths; writes the slots of {@code s}. */
    private void evaluate(double tauUs, double[] s) {
        if (!(tauUs > 0) || tauUs == Double.POSITIVE_INFINITY) {
            s[STATUS] = PixelStatus.INVALID.code();
            for (int k = 1; k < SLOTS - 1; k++) {
                s[k] = Double.NaN;
            }
            s[WARN] = 0;
            return;
        }
        double tauS = tauUs * Units.S_PER_US;
        double dn;
        double intrinsicRate;
        double k;
        double kMin;
        double kMax;
        double ft;
        if (fixedInjection) {
            dn = injectionParameter;
            intrinsicRate = fixedIntrinsicRate;
            k = fixedK;
            kMin = fixedKMin;
            kMax = fixedKMax;
            ft = fixedOccupancy;
        } else {
            dn = injectionParameter * tauS;
            intrinsicRate = intrinsic.rateConstantPerS(dn);
            k = srh.lifetimeDensityProductSCm3(dn);
            kMin = bounds.lower().lifetimeDensityProductSCm3(dn);
            kMax = bounds.upper().lifetimeDensityProductSCm3(dn);
            ft = srh.occupancy(dn);
        }
        double srhRate = 1.0 / tauS - intrinsicRate - surfaceRatePerS;
        int warn = baseWarnings;
        double nt;
        if (srhRate > 0) {
            s[STATUS] = PixelStatus.OK.code();
            s[TAU_SRH] = Units.US_PER_S / srhRate;
            nt = k * srhRate;
            s[NT_MIN] = kMin * srhRate;
            s[NT_MAX] = kMax * srhRate;
            if (nt > trapDensityLimitFactor * Math.min(dn, conditions.doping().densityPerCm3())) {
                warn |= ConversionWarning.TRAP_DENSITY_NOT_SMALL.bit();
            }
        } else {
            s[STATUS] = PixelStatus.BELOW_LIMIT.code();
            s[TAU_SRH] = Double.POSITIVE_INFINITY;
            // The SRH rate that would lower the limit lifetime 1/(1/τ_intr + 1/τ_surf) by the resolution δ.
            double limitRate = conditions.detectionResolution() * (intrinsicRate + surfaceRatePerS);
            nt = k * limitRate;
            s[NT_MIN] = kMin * limitRate;
            s[NT_MAX] = kMax * limitRate;
        }
        if (surfaceRatePerS * tauS > 0.5) {
            warn |= ConversionWarning.SURFACE_LIMITED.bit();
        }
        s[NT] = nt;
        s[DN] = dn;
        s[TAU_INTR] = Units.US_PER_S / intrinsicRate;
        s[FT] = ft;
        if (hasReference) {
            double refSrhRate = srhRate > 0 ? nt / referenceK : 0;
            s[TAU_REF] = Units.US_PER_S / (refSrhRate + referenceIntrinsicRate + surfaceRatePerS);
        } else {
            s[TAU_REF] = Double.NaN;
        }
        s[WARN] = warn;
    }

    /** Surface-limited lifetime, µs (infinite for ideal surfaces). */
    public double surfaceLifetimeUs() {
        return surfaceRatePerS == 0 ? Double.POSITIVE_INFINITY : Units.US_PER_S / surfaceRatePerS;
    }

    /**
     * Injection harmonisation: the effective lifetime (µs) a pixel with trap density {@code ntPerCm3} would have at
     * excess density {@code dnPerCm3}, with the same intrinsic and surface recombination.
     */
    public double lifetimeAtInjectionUs(double ntPerCm3, double dnPerCm3) {
        Checks.nonNegative(ntPerCm3, "trapDensity", "cm^-3");
        Checks.positive(dnPerCm3, "injection", "cm^-3");
        double rate = ntPerCm3 / srh.lifetimeDensityProductSCm3(dnPerCm3) + intrinsic.rateConstantPerS(dnPerCm3)
                + surfaceRatePerS;
        return Units.US_PER_S / rate;
    }

    public Conditions conditions() {
        return conditions;
    }

    public Defect defect() {
        return defect;
    }

    /** The SRH kinetics of the nominal defect parameters (n0, p0, n1, p1, capture coefficients). */
    public SrhRecombination srh() {
        return srh;
    }

    public IntrinsicLifetime intrinsic() {
        return intrinsic;
    }
}
