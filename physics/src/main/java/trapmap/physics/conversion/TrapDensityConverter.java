package trapmap.physics.conversion;

import java.util.EnumSet;
import java.util.Set;
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
 * K(Δn) = [(n0 + n1 + Δn)/c_p + (p0 + p1 + Δn)/c_n]/(n0 + p0 + Δn) = (a + b·Δn)/(n0 + p0 + Δn),
 *         a = (n0 + n1)/c_p + (p0 + p1)/c_n,  b = 1/c_p + 1/c_n
 * f_t(Δn) = (c_n n + c_p p1)/[c_n (n + n1) + c_p (p + p1)]
 *         = (c_n n0 + c_p p1 + c_n Δn)/[c_n (n0 + n1) + c_p (p0 + p1) + (c_n + c_p) Δn]
 * </pre>
 * The surface term uses the low-injection minority-carrier diffusivity of Klaassen's mobility at the wafer's doping,
 * so it is one number per wafer. When 1/τ_SRH is below the detection resolution δ·(1/τ_intr + 1/τ_surf) (δ = 0.05
 * by default) the pixel is {@link PixelStatus#BELOW_LIMIT} and the reported density is the detection limit
 * K·δ·(1/τ_intr + 1/τ_surf): the density whose SRH rate is δ times the rate of intrinsic and surface recombination
 * alone (it lowers the lifetime they allow by δ/(1 + δ), 4.8 % for δ = 0.05). The rule holds on both sides of the
 * limit lifetime, so the reported density (or bound) is continuous in τ_eff and never decreases as τ_eff decreases.
 * Lifetimes below {@link #LIFETIME_FLOOR_US} are {@link PixelStatus#INVALID}.
 * <p>
 * Everything that depends only on the wafer is computed once in the constructor, including the coefficients a, b of
 * K for the nominal defect and both bounds, which share the denominator n0 + p0 + Δn. A pixel then costs a few
 * arithmetic operations (fixed injection) or, for fixed generation, the intrinsic rate (two powers by table and
 * series, two square roots, see {@link IntrinsicLifetime}) and one division per rational term. The rearranged forms
 * agree with the literal ones to a few units in the last place. The single-pixel and array paths run the same
 * kernel, so their results agree exactly (array results are the single-pixel values rounded to float). Immutable and
 * thread-safe.
 */
public final class TrapDensityConverter {
    /**
     * The shortest effective lifetime converted, µs (1 ns); shorter ones are {@link PixelStatus#INVALID}. Two reasons
     * give the same order: carrier-lifetime tools for wafers (photoconductance, microwave photoconductance decay,
     * photoluminescence imaging) do not resolve lifetimes below about a nanosecond; and 1/τ = 1e9 s⁻¹ needs, for the
     * library's capture coefficients (σ·v_th about 1e-9–1e-7 cm³/s), trap densities of about 1e16–1e18 cm⁻³, which
     * is the doping of usual wafers and beyond the small-trap-density SRH model (N_t ≪ min(Δn, N_dop): Macdonald &amp;
     * Cuevas, PRB 67, 075203 (2003)). A smaller value is almost always a lifetime in seconds typed as µs.
     */
    public static final double LIFETIME_FLOOR_US = 1e-3;
    /** Δn/N_dop above which low-injection approximations (the surface diffusivity) are flagged. */
    private static final double LOW_INJECTION_LIMIT = 0.1;
    private final Conditions conditions;
    private final Defect defect;
    private final IntrinsicLifetime intrinsic;
    private final SrhRecombination srh;
    /** 1/τ_surf, 1/s (0 for ideal surfaces). */
    private final double surfaceRatePerS;
    private final boolean fixedInjection;
    /** Δn for fixed injection, or G (cm^-3 s^-1) for fixed generation. */
    private final double injectionParameter;
    private final double detectionResolution;
    /** N_t above this fraction of min(Δn, N_dop) raises {@link ConversionWarning#TRAP_DENSITY_NOT_SMALL}. */
    private final double trapDensityLimitFactor;
    private final double dopingPerCm3;
    private final int baseWarnings;
    /** Warnings that depend only on the conditions and the defect (validity ranges, conductivity type). */
    private final Set<ConversionWarning> conditionWarnings;
    // Per-wafer coefficients of the SRH terms (see the class comment).
    /** n0 + p0, cm^-3. */
    private final double sumN0P0;
    private final double kA;
    private final double kB;
    private final double kMinA;
    private final double kMinB;
    private final double kMaxA;
    private final double kMaxB;
    private final double ftNumA;
    private final double ftNumB;
    private final double ftDenA;
    private final double ftDenB;
    /** The injection terms at the fixed injection (null for fixed generation). */
    private final Pixel fixedTerms;
    // Reference injection for harmonised lifetimes.
    private final boolean hasReference;
    private final double referenceIntrinsicRate;
    private final double inverseReferenceK;

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
        SrhBounds bounds = SrhBounds.of(defect, conditions.doping(), conditions.silicon());
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
        detectionResolution = conditions.detectionResolution();
        trapDensityLimitFactor = 0.1;
        dopingPerCm3 = conditions.doping().densityPerCm3();
        int warn = 0;
        if (intrinsic.outsideValidatedTemperature()) {
            warn |= ConversionWarning.TEMPERATURE_NOT_300K.bit();
        }
        if (conditions.silicon().velocityModel() != defect.velocityConvention()) {
            warn |= ConversionWarning.VELOCITY_CONVENTION.bit();
        }
        baseWarnings = warn;
        conditionWarnings = validityWarnings(conditions, defect);

        sumN0P0 = srh.n0PerCm3() + srh.p0PerCm3();
        kA = kOffset(srh);
        kB = kSlope(srh);
        kMinA = kOffset(bounds.lower());
        kMinB = kSlope(bounds.lower());
        kMaxA = kOffset(bounds.upper());
        kMaxB = kSlope(bounds.upper());
        double cn = srh.electronCaptureCm3PerS();
        double cp = srh.holeCaptureCm3PerS();
        ftNumA = cn * srh.n0PerCm3() + cp * srh.p1PerCm3();
        ftNumB = cn;
        ftDenA = cn * (srh.n0PerCm3() + srh.n1PerCm3()) + cp * (srh.p0PerCm3() + srh.p1PerCm3());
        ftDenB = cn + cp;

        if (fixedInjection) {
            fixedTerms = new Pixel();
            injectionTerms(injectionParameter, fixedTerms);
        } else {
            fixedTerms = null;
        }
        double ref = conditions.referenceInjectionPerCm3();
        hasReference = !Double.isNaN(ref);
        referenceIntrinsicRate = hasReference ? intrinsic.rateConstantPerS(ref) : Double.NaN;
        inverseReferenceK = hasReference ? 1.0 / lifetimeDensityProduct(ref) : Double.NaN;
    }

    /**
     * The wafer-level warnings of {@code conditions} and {@code defect}: temperature outside the n_i model's fitted
     * range, below the freeze-out limit, doping above the Boltzmann limit ({@link trapmap.physics.material.Doping}),
     * a defect that does not suit the wafer's conductivity type ({@link trapmap.physics.defect.DefectLibrary}).
     */
    public static Set<ConversionWarning> validityWarnings(Conditions conditions, Defect defect) {
        Set<ConversionWarning> w = EnumSet.noneOf(ConversionWarning.class);
        if (conditions.silicon().outsideIntrinsicDensityFit()) {
            w.add(ConversionWarning.TEMPERATURE_OUTSIDE_NI_FIT);
        }
        if (conditions.silicon().temperatureK() < trapmap.physics.material.Doping.FULL_IONISATION_MIN_TEMPERATURE_K) {
            w.add(ConversionWarning.DOPANT_FREEZE_OUT);
        }
        if (conditions.doping().densityPerCm3() > trapmap.physics.material.Doping.BOLTZMANN_LIMIT_PER_CM3) {
            w.add(ConversionWarning.DOPING_ABOVE_BOLTZMANN);
        }
        ConversionWarning type = ConversionWarning.forType(defect, conditions.doping().type());
        if (type != null) {
            w.add(type);
        }
        return Set.copyOf(w);
    }

    /** The wafer-level warnings of this conversion (the same for every pixel; never in a warning mask). */
    public Set<ConversionWarning> conditionWarnings() {
        return conditionWarnings;
    }

    /** a = (n0 + n1)/c_p + (p0 + p1)/c_n of K = (a + b·Δn)/(n0 + p0 + Δn), s·cm^-6. */
    private static double kOffset(SrhRecombination s) {
        return (s.n0PerCm3() + s.n1PerCm3()) / s.holeCaptureCm3PerS()
                + (s.p0PerCm3() + s.p1PerCm3()) / s.electronCaptureCm3PerS();
    }

    /** b = 1/c_p + 1/c_n of K = (a + b·Δn)/(n0 + p0 + Δn), s·cm^-3. */
    private static double kSlope(SrhRecombination s) {
        return 1.0 / s.holeCaptureCm3PerS() + 1.0 / s.electronCaptureCm3PerS();
    }

    /**
     * The injection-dependent terms of the kernel at {@code dn} into {@code px}: Δn, 1/τ_intr, K of the nominal
     * defect and both bounds, f_t. Once per wafer for fixed injection, per pixel for fixed generation.
     */
    private void injectionTerms(double dn, Pixel px) {
        double inverseSum = 1.0 / (sumN0P0 + dn);
        px.dn = dn;
        px.intrinsicRate = intrinsic.rateConstantPerS(dn);
        px.k = (kA + kB * dn) * inverseSum;
        px.kMin = (kMinA + kMinB * dn) * inverseSum;
        px.kMax = (kMaxA + kMaxB * dn) * inverseSum;
        px.occupancy = (ftNumA + ftNumB * dn) / (ftDenA + ftDenB * dn);
    }

    /** K(Δn) of the nominal defect, s·cm^-3 (N_t = K/τ_SRH), as in {@link #injectionTerms}. */
    private double lifetimeDensityProduct(double dn) {
        return (kA + kB * dn) * (1.0 / (sumN0P0 + dn));
    }

    /** Converts one pixel's effective lifetime (µs). */
    public PixelResult convert(double effectiveLifetimeUs) {
        Pixel px = new Pixel();
        evaluate(effectiveLifetimeUs, px);
        Set<ConversionWarning> warnings = EnumSet.noneOf(ConversionWarning.class);
        warnings.addAll(ConversionWarning.fromMask(px.warnings));
        if (px.status != PixelStatus.INVALID.code()) {
            warnings.addAll(conditionWarnings);
        }
        return new PixelResult(PixelStatus.ofCode(px.status), px.dn, effectiveLifetimeUs,
                Units.US_PER_S / px.intrinsicRate, surfaceLifetimeUs(), px.srhLifetimeUs, px.nt, px.ntMin, px.ntMax,
                px.occupancy, px.lifetimeAtReferenceUs, warnings);
    }

    /** Converts a raster with all available processors. */
    public void convert(float[] effectiveLifetimeUs, int width, ConversionOutput out) {
        convert(effectiveLifetimeUs, width, out, Runtime.getRuntime().availableProcessors());
    }

    /**
     * Converts a row-major raster of effective lifetimes (µs) in parallel over rows. A NaN sample is a pixel without
     * data (outside the wafer or masked) and gets {@link PixelStatus#NO_DATA}; every other sample gets exactly the
     * single-pixel result of {@link #convert(double)} (where a NaN lifetime is {@link PixelStatus#INVALID}).
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
        Pixel px = new Pixel();
        for (int i = rowFrom * width, end = rowTo * width; i < end; i++) {
            float t = tau[i];
            if (t != t) { // NaN: no data
                storeNoData(out, i);
                continue;
            }
            // evaluate(t, px), with its stages called here: each is small enough for the JIT compiler to inline into
            // this loop, which it may decline for evaluate as a whole once that is compiled on its own.
            if (valid(t)) {
                injectionStage(t, px);
                rateStage(t, px);
            } else {
                invalid(px);
            }
            store(out, i, px);
        }
    }

    private static void store(ConversionOutput out, int i, Pixel px) {
        if (out.trapDensity != null) {
            out.trapDensity[i] = (float) px.nt;
        }
        if (out.trapDensityMin != null) {
            out.trapDensityMin[i] = (float) px.ntMin;
        }
        if (out.trapDensityMax != null) {
            out.trapDensityMax[i] = (float) px.ntMax;
        }
        if (out.occupancy != null) {
            out.occupancy[i] = (float) px.occupancy;
        }
        if (out.srhLifetimeUs != null) {
            out.srhLifetimeUs[i] = (float) px.srhLifetimeUs;
        }
        if (out.injection != null) {
            out.injection[i] = (float) px.dn;
        }
        if (out.lifetimeAtReferenceUs != null) {
            out.lifetimeAtReferenceUs[i] = (float) px.lifetimeAtReferenceUs;
        }
        if (out.status != null) {
            out.status[i] = px.status;
        }
        if (out.warnings != null) {
            out.warnings[i] = px.warnings;
        }
    }

    private static void storeNoData(ConversionOutput out, int i) {
        float nan = Float.NaN;
        if (out.trapDensity != null) {
            out.trapDensity[i] = nan;
        }
        if (out.trapDensityMin != null) {
            out.trapDensityMin[i] = nan;
        }
        if (out.trapDensityMax != null) {
            out.trapDensityMax[i] = nan;
        }
        if (out.occupancy != null) {
            out.occupancy[i] = nan;
        }
        if (out.srhLifetimeUs != null) {
            out.srhLifetimeUs[i] = nan;
        }
        if (out.injection != null) {
            out.injection[i] = nan;
        }
        if (out.lifetimeAtReferenceUs != null) {
            out.lifetimeAtReferenceUs[i] = nan;
        }
        if (out.status != null) {
            out.status[i] = PixelStatus.NO_DATA.code();
        }
        if (out.warnings != null) {
            out.warnings[i] = 0;
        }
    }

    /** The kernel's working values and results for one pixel; each worker reuses one instance. */
    private static final class Pixel {
        // Injection terms.
        /** Δn, cm^-3. */
        double dn;
        /** 1/τ_intr, 1/s. */
        double intrinsicRate;
        /** K of the nominal defect and of the bounds, s·cm^-3. */
        double k;
        double kMin;
        double kMax;
        /** f_t. */
        double occupancy;
        // Results.
        byte status;
        byte warnings;
        double srhLifetimeUs;
        double nt;
        double ntMin;
        double ntMax;
        double lifetimeAtReferenceUs;

        void copyInjectionTerms(Pixel from) {
            dn = from.dn;
            intrinsicRate = from.intrinsicRate;
            k = from.k;
            kMin = from.kMin;
            kMax = from.kMax;
            occupancy = from.occupancy;
        }
    }

    /**
     * The kernel shared by both paths: fills {@code px} for an effective lifetime of {@code tauUs} µs. The array
     * loop runs the same stages.
     */
    private void evaluate(double tauUs, Pixel px) {
        if (valid(tauUs)) {
            injectionStage(tauUs, px);
            rateStage(tauUs, px);
        } else {
            invalid(px);
        }
    }

    /**
     * Finite and at least {@link #LIFETIME_FLOOR_US}: a lifetime the kernel converts ({@link PixelStatus#INVALID}
     * otherwise; NaN fails the comparison).
     */
    private static boolean valid(double tauUs) {
        return tauUs >= LIFETIME_FLOOR_US && tauUs != Double.POSITIVE_INFINITY;
    }

    /** Stage 1: Δn and the terms that depend on it. */
    private void injectionStage(double tauUs, Pixel px) {
        if (fixedInjection) {
            px.copyInjectionTerms(fixedTerms);
        } else {
            injectionTerms(injectionParameter * (tauUs * Units.S_PER_US), px);
        }
    }

    /** Stage 2: the SRH rate and everything derived from it. */
    private void rateStage(double tauUs, Pixel px) {
        double tauS = tauUs * Units.S_PER_US;
        double intrinsicRate = px.intrinsicRate;
        double srhRate = 1.0 / tauS - intrinsicRate - surfaceRatePerS;
        // The smallest SRH rate the conversion resolves: δ·(1/τ_intr + 1/τ_surf). Below it (on either side of the
        // limit lifetime) the pixel is BELOW_LIMIT and reports the density of that rate, so N_t is continuous and
        // never decreases as τ_eff decreases.
        double detectableRate = detectionResolution * (intrinsicRate + surfaceRatePerS);
        int warn = baseWarnings;
        double rate;
        boolean ok = srhRate >= detectableRate;
        if (ok) {
            px.status = PixelStatus.OK.code();
            px.srhLifetimeUs = Units.US_PER_S / srhRate;
            rate = srhRate;
        } else {
            px.status = PixelStatus.BELOW_LIMIT.code();
            px.srhLifetimeUs = Double.POSITIVE_INFINITY;
            rate = detectableRate;
        }
        double nt = px.k * rate;
        if (ok && nt > trapDensityLimitFactor * Math.min(px.dn, dopingPerCm3)) {
            warn |= ConversionWarning.TRAP_DENSITY_NOT_SMALL.bit();
        }
        if (surfaceRatePerS > 0) {
            if (surfaceRatePerS * tauS > 0.5) {
                warn |= ConversionWarning.SURFACE_LIMITED.bit();
            }
            if (px.dn > LOW_INJECTION_LIMIT * dopingPerCm3) {
                warn |= ConversionWarning.SURFACE_LOW_INJECTION_DIFFUSIVITY.bit();
            }
        }
        px.nt = nt;
        px.ntMin = px.kMin * rate;
        px.ntMax = px.kMax * rate;
        if (hasReference) {
            double refSrhRate = ok ? nt * inverseReferenceK : 0;
            px.lifetimeAtReferenceUs = Units.US_PER_S / (refSrhRate + referenceIntrinsicRate + surfaceRatePerS);
        } else {
            px.lifetimeAtReferenceUs = Double.NaN;
        }
        px.warnings = (byte) warn;
    }

    private static void invalid(Pixel px) {
        px.status = PixelStatus.INVALID.code();
        px.warnings = 0;
        px.dn = Double.NaN;
        px.intrinsicRate = Double.NaN;
        px.k = Double.NaN;
        px.kMin = Double.NaN;
        px.kMax = Double.NaN;
        px.srhLifetimeUs = Double.NaN;
        px.nt = Double.NaN;
        px.ntMin = Double.NaN;
        px.ntMax = Double.NaN;
        px.occupancy = Double.NaN;
        px.lifetimeAtReferenceUs = Double.NaN;
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
        double rate = ntPerCm3 / lifetimeDensityProduct(dnPerCm3) + intrinsic.rateConstantPerS(dnPerCm3)
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
