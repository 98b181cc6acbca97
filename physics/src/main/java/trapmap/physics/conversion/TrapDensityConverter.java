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
 * agree with the literal ones to a few units in the last place. The array kernel runs the single-pixel path's
 * operations in the same order, so their results agree exactly (array results are the single-pixel values rounded to
 * float); it computes only the planes asked for, takes its per-pixel decisions without branches, and counts statuses
 * and warnings on the way ({@link Tally}). Rasters convert whole ({@link #convert(float[], int, ConversionOutput,
 * int)}, over threads) or band by band ({@link #convertRows}). Immutable and thread-safe.
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

    /** Converts a raster with all available processors; returns the counts of statuses and warnings. */
    public Tally convert(float[] effectiveLifetimeUs, int width, ConversionOutput out) {
        return convert(effectiveLifetimeUs, width, out, Runtime.getRuntime().availableProcessors());
    }

    /**
     * Converts a row-major raster of effective lifetimes (µs) in parallel over rows. A NaN sample is a pixel without
     * data (outside the wafer or masked) and gets {@link PixelStatus#NO_DATA}; every other sample gets exactly the
     * single-pixel result of {@link #convert(double)} (where a NaN lifetime is {@link PixelStatus#INVALID}). Only the
     * non-null planes of {@code out} are computed. The returned {@link Tally} counts the statuses and per-pixel
     * warnings of all pixels whether or not {@code out} has status or warning planes; it is the same for any number
     * of threads, and so are the planes.
     *
     * @param width   raster width in pixels; the length must be a multiple of it
     * @param threads number of threads (1 runs on the calling thread)
     */
    public Tally convert(float[] effectiveLifetimeUs, int width, ConversionOutput out, int threads) {
        int n = effectiveLifetimeUs.length;
        if (width <= 0 || n % width != 0) {
            throw new IllegalArgumentException("raster of " + n + " pixels is not a whole number of rows of "
                    + width);
        }
        out.checkLength(n);
        int rows = n / width;
        Tally total = new Tally();
        if (threads <= 1 || rows < 2) {
            convertRange(effectiveLifetimeUs, 0, n, out, total);
            return total;
        }
        int blocks = Math.min(rows, threads * 16);
        Tally[] parts = new Tally[blocks];
        ForkJoinPool pool = new ForkJoinPool(threads);
        try {
            pool.submit(() -> IntStream.range(0, blocks).parallel().forEach(b -> {
                Tally t = new Tally();
                convertRange(effectiveLifetimeUs, (int) ((long) rows * b / blocks) * width,
                        (int) ((long) rows * (b + 1) / blocks) * width, out, t);
                parts[b] = t;
            })).join();
        } finally {
            pool.shutdown();
        }
        for (Tally t : parts) {
            total.add(t);
        }
        return total;
    }

    /**
     * Converts the rows {@code [rowFrom, rowTo)} of a row-major raster of effective lifetimes (µs) into the same rows
     * of {@code out}, on the calling thread, and adds their statuses and warnings to {@code tally}: the entry point
     * for converting a map band by band (strip by strip while it is read, or one band per worker). The planes of
     * {@code out} are indexed like {@code effectiveLifetimeUs}; they may be as long as the raster or, for a band
     * converted on its own, as long as the band (then pass the band as its own raster with rows from 0). Each pixel
     * gets exactly the value {@link #convert(float[], int, ConversionOutput, int)} gives it, so converting a raster
     * in any bands gives the same planes and, summed, the same tally. Only the non-null planes are computed.
     *
     * @throws IllegalArgumentException when the rows do not lie inside the raster or a plane is too short for them
     */
    public void convertRows(float[] effectiveLifetimeUs, int width, int rowFrom, int rowTo, ConversionOutput out,
                            Tally tally) {
        long from = (long) rowFrom * width;
        long to = (long) rowTo * width;
        if (width <= 0 || rowFrom < 0 || rowFrom > rowTo || to > effectiveLifetimeUs.length) {
            throw new IllegalArgumentException("rows " + rowFrom + " to " + rowTo + " of width " + width
                    + " do not lie in a raster of " + effectiveLifetimeUs.length + " pixels");
        }
        out.checkAtLeast((int) to);
        convertRange(effectiveLifetimeUs, (int) from, (int) to, out, Checks.notNull(tally, "tally"));
    }

    /**
     * Counts of a conversion: pixels by {@link PixelStatus}, pixels by per-pixel {@link ConversionWarning}, and the
     * pixels whose lifetime is positive but below {@link #LIFETIME_FLOOR_US} (INVALID), with how many of those would
     * be ordinary lifetimes (1 ns to 0.1 s) if they were seconds read as µs. Mutable, for one thread; add the tallies
     * of several bands with {@link #add}.
     */
    public static final class Tally {
        private final int[] statusCounts = new int[PixelStatus.values().length];
        private final int[] warningPixels = new int[Byte.SIZE];
        private int belowFloor;
        private int belowFloorLikeSeconds;

        /** Adds the counts of {@code other} to these. */
        public void add(Tally other) {
            for (int k = 0; k < statusCounts.length; k++) {
                statusCounts[k] += other.statusCounts[k];
            }
            for (int k = 0; k < warningPixels.length; k++) {
                warningPixels[k] += other.warningPixels[k];
            }
            belowFloor += other.belowFloor;
            belowFloorLikeSeconds += other.belowFloorLikeSeconds;
        }

        /** The number of pixels of each status, indexed by {@link PixelStatus#code()} (a copy). */
        public int[] statusCounts() {
            return statusCounts.clone();
        }

        /** The number of pixels of {@code status}. */
        public int count(PixelStatus status) {
            return statusCounts[status.code()];
        }

        /** The number of pixels with each per-pixel warning, indexed by {@link ConversionWarning#ordinal()} (a copy). */
        public int[] warningPixels() {
            return warningPixels.clone();
        }

        /** The union of the per-pixel warnings of all pixels, as a mask of {@link ConversionWarning#bit()}s. */
        public int warningBits() {
            int bits = 0;
            for (int k = 0; k < warningPixels.length; k++) {
                if (warningPixels[k] > 0) {
                    bits |= 1 << k;
                }
            }
            return bits;
        }

        /** Pixels with 0 &lt; τ_eff &lt; {@link #LIFETIME_FLOOR_US} (INVALID). */
        public int belowFloor() {
            return belowFloor;
        }

        /** Of {@link #belowFloor()}, those whose value read as seconds lies in 1 ns … 0.1 s. */
        public int belowFloorLikeSeconds() {
            return belowFloorLikeSeconds;
        }
    }

    private static final int NOT_SMALL_BIT = ConversionWarning.TRAP_DENSITY_NOT_SMALL.bit();
    private static final int SURFACE_LIMITED_BIT = ConversionWarning.SURFACE_LIMITED.bit();
    private static final int LOW_INJECTION_BIT = ConversionWarning.SURFACE_LOW_INJECTION_DIFFUSIVITY.bit();
    private static final byte OK_CODE = PixelStatus.OK.code();
    private static final byte BELOW_LIMIT_CODE = PixelStatus.BELOW_LIMIT.code();

    /**
     * Pixels of one call of {@link #convertBlock}. A conversion of many pixels in one call (the batch converts a whole
     * wafer as one row) runs as many short calls of the loop, so that the just-in-time compiler compiles the loop
     * once as a method, with the loop's exit in its profile, and reuses that code for every caller and every map.
     * One long call would have it compiled again on the stack for that call alone, and that code would be thrown
     * away at the loop's exit, which its profile had never seen. A block costs its call and a few additions of
     * counts, well under 1 % of its pixels' time.
     */
    static final int BLOCK_PIXELS = 1024;

    /**
     * The array kernel over the pixels {@code [from, to)}, in blocks of {@value #BLOCK_PIXELS} pixels: each pixel
     * and each count is the same for any split, so the blocks change no result.
     */
    private void convertRange(float[] tau, int from, int to, ConversionOutput out, Tally tally) {
        for (int start = from; start < to; ) {
            int end = to - start > BLOCK_PIXELS ? start + BLOCK_PIXELS : to;
            convertBlock(tau, start, end, out, tally);
            start = end;
        }
    }

    /**
     * The array kernel over the pixels {@code [from, to)}: the operations of {@link #injectionStage} and
     * {@link #rateStage} in the same order (so each value is bit-identical to the single-pixel path), with the
     * per-wafer terms in locals, nothing allocated, the terms of planes that are null not computed, and the statuses
     * and warnings counted on the way.
     */
    private void convertBlock(float[] tau, int from, int to, ConversionOutput out, Tally tally) {
        final float[] ntOut = out.trapDensity;
        final float[] minOut = out.trapDensityMin;
        final float[] maxOut = out.trapDensityMax;
        final float[] occOut = out.occupancy;
        final float[] srhOut = out.srhLifetimeUs;
        final float[] dnOut = out.injection;
        final float[] refOut = out.lifetimeAtReferenceUs;
        final byte[] statusOut = out.status;
        final byte[] warnOut = out.warnings;
        final boolean generation = !fixedInjection;
        final double g = injectionParameter;
        final double surface = surfaceRatePerS;
        final int surfaceFlag = surface > 0 ? 1 : 0;
        final double resolution = detectionResolution;
        final double limitFactor = trapDensityLimitFactor;
        final double doping = dopingPerCm3;
        final double lowInjection = LOW_INJECTION_LIMIT * dopingPerCm3;
        final boolean reference = hasReference;
        final double refIntrinsic = referenceIntrinsicRate;
        final double invRefK = inverseReferenceK;
        final double sum0 = sumN0P0;
        final double ka = kA;
        final double kb = kB;
        final double kMinAl = kMinA;
        final double kMinBl = kMinB;
        final double kMaxAl = kMaxA;
        final double kMaxBl = kMaxB;
        final double ftNa = ftNumA;
        final double ftNb = ftNumB;
        final double ftDa = ftDenA;
        final double ftDb = ftDenB;
        final IntrinsicLifetime intr = intrinsic;
        final int base = baseWarnings;
        // The injection terms: constants for fixed injection, per pixel for fixed generation.
        double dn = generation ? Double.NaN : fixedTerms.dn;
        double intrinsicRate = generation ? Double.NaN : fixedTerms.intrinsicRate;
        double k = generation ? Double.NaN : fixedTerms.k;
        double kMin = generation ? Double.NaN : fixedTerms.kMin;
        double kMax = generation ? Double.NaN : fixedTerms.kMax;
        double occupancy = generation ? Double.NaN : fixedTerms.occupancy;
        int ok = 0;
        int notSmall = 0;
        int surfaceLimited = 0;
        int lowInjectionCount = 0;
        int skipped = 0;
        for (int i = from; i < to; i++) {
            double tauUs = tau[i];
            if (!(tauUs >= LIFETIME_FLOOR_US && tauUs != Double.POSITIVE_INFINITY)) {
                notConverted(tau[i], out, i, tally);
                skipped++;
                continue;
            }
            double tauS = tauUs * Units.S_PER_US;
            if (generation) {
                dn = g * tauS;
                double inverseSum = 1.0 / (sum0 + dn);
                intrinsicRate = intr.rateConstantPerS(dn);
                k = (ka + kb * dn) * inverseSum;
                if (minOut != null) {
                    kMin = (kMinAl + kMinBl * dn) * inverseSum;
                }
                if (maxOut != null) {
                    kMax = (kMaxAl + kMaxBl * dn) * inverseSum;
                }
                if (occOut != null) {
                    occupancy = (ftNa + ftNb * dn) / (ftDa + ftDb * dn);
                }
            }
            double srhRate = 1.0 / tauS - intrinsicRate - surface;
            double detectableRate = resolution * (intrinsicRate + surface);
            // The decisions below are taken without branches, since on a map they fall either way at random and a
            // mispredicted branch costs more than the whole pixel: for a converted pixel every value compared is
            // finite (τ_eff < 3.5e32 s, G ≤ 1e24 cm^-3 s^-1) and each right-hand side is > 0, so a > b exactly when
            // b − a is negative (it is +0 when they are equal), i.e. has its sign bit set.
            int below = signBit(srhRate - detectableRate); // 1: BELOW_LIMIT, 0: OK (srhRate >= detectableRate)
            double rate = select(below, srhRate, detectableRate);
            double nt = k * rate;
            ok += 1 - below;
            double smaller = select(signBit(doping - dn), dn, doping); // min(Δn, N_dop); Math.min is slow in C2
            int small = (1 - below) & signBit(limitFactor * smaller - nt);
            int limited = signBit(0.5 - surface * tauS);
            int lowInj = surfaceFlag & signBit(lowInjection - dn);
            notSmall += small;
            surfaceLimited += limited;
            lowInjectionCount += lowInj;
            if (ntOut != null) {
                ntOut[i] = (float) nt;
            }
            if (minOut != null) {
                minOut[i] = (float) (kMin * rate);
            }
            if (maxOut != null) {
                maxOut[i] = (float) (kMax * rate);
            }
            if (occOut != null) {
                occOut[i] = (float) occupancy;
            }
            if (srhOut != null) {
                srhOut[i] = (float) select(below, Units.US_PER_S / srhRate, Double.POSITIVE_INFINITY);
            }
            if (dnOut != null) {
                dnOut[i] = (float) dn;
            }
            if (refOut != null) {
                refOut[i] = reference ? (float) (Units.US_PER_S / (select(below, nt * invRefK, 0) + refIntrinsic
                        + surface)) : Float.NaN;
            }
            if (statusOut != null) {
                statusOut[i] = (byte) (OK_CODE + below * (BELOW_LIMIT_CODE - OK_CODE));
            }
            if (warnOut != null) {
                warnOut[i] = (byte) (base | (small * NOT_SMALL_BIT) | (limited * SURFACE_LIMITED_BIT)
                        | (lowInj * LOW_INJECTION_BIT));
            }
        }
        int converted = to - from - skipped;
        int below = converted - ok;
        tally.statusCounts[OK_CODE] += ok;
        tally.statusCounts[BELOW_LIMIT_CODE] += below;
        for (int b = 0; b < Byte.SIZE; b++) {
            if ((base & (1 << b)) != 0) {
                tally.warningPixels[b] += converted;
            }
        }
        tally.warningPixels[Integer.numberOfTrailingZeros(NOT_SMALL_BIT)] += notSmall;
        tally.warningPixels[Integer.numberOfTrailingZeros(SURFACE_LIMITED_BIT)] += surfaceLimited;
        tally.warningPixels[Integer.numberOfTrailingZeros(LOW_INJECTION_BIT)] += lowInjectionCount;
    }

    /** 1 when {@code x} is negative (or −0), else 0: the sign bit, read without a branch. */
    private static int signBit(double x) {
        return (int) (Double.doubleToRawLongBits(x) >>> 63);
    }

    /** {@code a} when {@code pickB} is 0, {@code b} when it is 1, exactly and without a branch. */
    private static double select(int pickB, double a, double b) {
        long mask = -(long) pickB;
        return Double.longBitsToDouble((Double.doubleToRawLongBits(a) & ~mask) | (Double.doubleToRawLongBits(b) & mask));
    }

    /** A NaN (no data) or invalid sample at {@code i}: NaN in every plane, its status, no warnings, counted. */
    private static void notConverted(float t, ConversionOutput out, int i, Tally tally) {
        byte code;
        if (t != t) {
            code = PixelStatus.NO_DATA.code();
        } else {
            code = PixelStatus.INVALID.code();
            if (t > 0 && t < LIFETIME_FLOOR_US) {
                tally.belowFloor++;
                double asSeconds = t * 1e6;
                if (asSeconds >= LIFETIME_FLOOR_US && asSeconds <= 1e5) {
                    tally.belowFloorLikeSeconds++;
                }
            }
        }
        tally.statusCounts[code]++;
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
            out.status[i] = code;
        }
        if (out.warnings != null) {
            out.warnings[i] = 0;
        }
    }

    /** The working values and results of one pixel on the single-pixel path. */
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
     * The single-pixel kernel: fills {@code px} for an effective lifetime of {@code tauUs} µs. The array kernel
     * ({@code convertBlock}) runs the same operations in the same order.
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
