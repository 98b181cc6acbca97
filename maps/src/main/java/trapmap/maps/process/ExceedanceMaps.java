package trapmap.maps.process;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;
import trapmap.maps.io.UncertaintySettings;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.physics.uncertainty.ConditionUncertainty;
import trapmap.physics.uncertainty.ExceedanceModel;
import trapmap.physics.uncertainty.QuantileTable;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * Maps of the probability that a pixel's equivalent trap density exceeds a threshold N*, and of confidence quantiles
 * of that density, over the uncertainty of the defect parameters, the measurement conditions and the measured
 * lifetime: the maps-level face of the physics {@link ExceedanceModel} (method and sources in its class comment).
 * Prepared once per wafer from its conditions, defect, settings, uncertainty, N*, sample count and seed; immutable
 * and thread-safe, so that the viewer's readout ({@link #probabilityAt}, {@link #quantileAt}) and the whole-map passes
 * share one instance.
 * <p>
 * Every pixel is computed on its own from the prepared samples (probability: the model's count of threshold lifetimes
 * above the pixel's, found through a bucket table of the float lifetimes, {@code ProbabilityLookup}; quantile: {@link QuantileTable} over the map's lifetime range, exact), so a map made on any
 * number of threads equals the one-thread map, value for value. A PL-counts map is first turned into lifetimes by its
 * calibration ({@link MapConversion#lifetimeFromPl}). Pixels the conversion does not convert (NaN, ≤ 0, infinite,
 * below {@link TrapDensityConverter#LIFETIME_FLOOR_US}) are NaN.
 */
public final class ExceedanceMaps {
    /** Samples when none are given ({@link UncertaintySettings#DEFAULT_SAMPLES}): probability steps of 1e-4. */
    public static final int DEFAULT_SAMPLES = UncertaintySettings.DEFAULT_SAMPLES;
    /** Seed when none is given ({@link UncertaintySettings#DEFAULT_SEED}). */
    public static final long DEFAULT_SEED = UncertaintySettings.DEFAULT_SEED;
    /** Rows a thread takes at a time. */
    private static final int ROWS_PER_TASK = 8;

    private final ExceedanceModel model;
    private final ProbabilityLookup lookup;
    private final String defectId;
    private final ConditionUncertainty uncertainty;
    private final long seed;
    private final ProcessingStep step;

    private ExceedanceMaps(ExceedanceModel model, String defectId, ConditionUncertainty uncertainty, long seed,
                           ProcessingStep step) {
        this.model = model;
        this.lookup = new ProbabilityLookup(model.thresholdLifetimesUs());
        this.defectId = defectId;
        this.uncertainty = uncertainty;
        this.seed = seed;
        this.step = step;
    }

    /**
     * Draws the samples of one wafer.
     *
     * @param conditions      the wafer's measurement conditions (sidecar values with the user's overrides)
     * @param defect          the defect, with its published parameter spread (none: nominal parameters)
     * @param settings        the conversion settings (physics models, detection resolution)
     * @param uncertainty     the condition and lifetime uncertainties
     * @param thresholdPerCm3 the threshold N*, cm⁻³ (&gt; 0)
     * @param samples         Monte Carlo samples ({@value ExceedanceModel#MIN_SAMPLES} – 4194304)
     * @param seed            seed of the draws (the same seed gives the same maps)
     * @throws InvalidValueException naming the field and unit: missing conditions, a fixed generation rate, a
     *                               defect without absolute cross-sections, a value out of range
     */
    public static ExceedanceMaps prepare(MeasurementConditions conditions, Defect defect, ConversionSettings settings,
                                         ConditionUncertainty uncertainty, double thresholdPerCm3, int samples,
                                         long seed) {
        Checks.notNull(conditions, "conditions");
        Checks.notNull(defect, "defect");
        Checks.notNull(settings, "settings");
        Checks.notNull(uncertainty, "uncertainty");
        Conditions physics = MapConversion.physicsConditions(conditions, settings);
        ExceedanceModel model = ExceedanceModel.prepare(physics, defect, settings.physics(), uncertainty,
                thresholdPerCm3, samples, seed);
        ProcessingStep convert = MapConversion.convertStep(physics, defect, settings);
        Map<String, String> p = new LinkedHashMap<>(convert.parameters());
        p.put("threshold_cm3", Double.toString(thresholdPerCm3));
        p.put("samples", Integer.toString(samples));
        p.put("seed", Long.toString(seed));
        p.put("uncertainty.doping_relative", Double.toString(uncertainty.dopingRelative()));
        p.put("uncertainty.thickness_relative", Double.toString(uncertainty.thicknessRelative()));
        p.put("uncertainty.srv_relative", Double.toString(uncertainty.srvRelative()));
        p.put("uncertainty.injection_relative", Double.toString(uncertainty.injectionRelative()));
        p.put("uncertainty.temperature_k", Double.toString(uncertainty.temperatureK()));
        p.put("uncertainty.lifetime_relative", Double.toString(uncertainty.lifetimeRelative()));
        return new ExceedanceMaps(model, defect.id(), uncertainty, seed, new ProcessingStep("exceedance", p));
    }

    /**
     * {@link #prepare(MeasurementConditions, Defect, ConversionSettings, ConditionUncertainty, double, int, long)}
     * with the uncertainties, samples and seed of {@code u} (a physics settings file's or rules' block).
     */
    public static ExceedanceMaps prepare(MeasurementConditions conditions, Defect defect, ConversionSettings settings,
                                         UncertaintySettings u, double thresholdPerCm3) {
        Checks.notNull(u, "uncertainty settings");
        return prepare(conditions, defect, settings, u.uncertainty(), thresholdPerCm3, u.samples(), u.seed());
    }

    /**
     * {@link #prepare(MeasurementConditions, Defect, ConversionSettings, ConditionUncertainty, double, int, long)}
     * with the conditions of {@code map}.
     */
    public static ExceedanceMaps prepare(WaferMap map, Defect defect, ConversionSettings settings,
                                         ConditionUncertainty uncertainty, double thresholdPerCm3, int samples,
                                         long seed) {
        return prepare(Checks.notNull(map, "map").conditions(), defect, settings, uncertainty, thresholdPerCm3,
                samples, seed);
    }

    /**
     * P(N_t &gt; N*) of a pixel measured at {@code tauUs} µs effective lifetime, 0…1 (a share of the samples); NaN
     * for a lifetime the conversion does not convert.
     */
    public double probabilityAt(double tauUs) {
        return model.probability((float) tauUs);
    }

    /**
     * The {@code q} quantile (0 &lt; q &lt; 1) of the equivalent trap density, cm⁻³, of a pixel measured at
     * {@code tauUs} µs (one pass over the samples, about 0.1 ms at 10⁴ samples: for a readout, not a map); NaN for a
     * lifetime the conversion does not convert.
     */
    public double quantileAt(double tauUs, double q) {
        return model.quantile((float) tauUs, q);
    }

    /**
     * The effective lifetime τ_c, µs, below which a pixel's probability of exceeding N* is at least {@code
     * confidence}: P(τ) ≥ c exactly when τ &lt; τ_c (P falls as τ rises). With S samples and threshold lifetimes
     * τ*_(1) ≤ … ≤ τ*_(S), P(τ) = #{τ*_s &gt; τ}/S ≥ c needs m = ⌈c·S⌉ of them above τ, so τ_c = τ*_(S−m+1). A
     * pixel test against one lifetime: what a flag with a confidence costs.
     *
     * @param confidence 0 &lt; c ≤ 1
     */
    public double confidentLifetimeUs(double confidence) {
        if (!(confidence > 0 && confidence <= 1)) {
            throw new InvalidValueException("confidence", "", "the confidence must lie in (0, 1] (got " + trapmap.shared.check.Checks.exact(confidence) + ")");
        }
        double[] sorted = model.thresholdLifetimesUs();
        int s = sorted.length;
        // the smallest count m with m / S >= c, as probability() computes the share (a double division)
        int m = Math.max(1, Math.min(s, (int) Math.ceil(confidence * s)));
        while (m > 1 && (double) (m - 1) / s >= confidence) {
            m--;
        }
        while (m < s && (double) m / s < confidence) {
            m++;
        }
        return sorted[s - m];
    }

    /** The probability map of a lifetime (µs) or PL-counts map, with all available processors. */
    public WaferMap probabilityMap(WaferMap map) {
        return probabilityMap(map, Runtime.getRuntime().availableProcessors());
    }

    /**
     * The map of P(N_t &gt; N*), 0…1 ({@link Quantity#EXCEEDANCE_PROBABILITY}), of a lifetime (µs) or PL-counts map,
     * on {@code threads} threads (same values on any number).
     */
    public WaferMap probabilityMap(WaferMap map, int threads) {
        WaferMap lifetime = lifetimeOf(map);
        float[] tau = lifetime.raster().samples();
        float[] out = new float[tau.length];
        byRows(tau, lifetime.width(), threads, (from, to) -> {
            for (int i = from; i < to; i++) {
                out[i] = lookup.probabilityAsFloat(tau[i]);
            }
        });
        return lifetime.derive(FloatRaster.wrap(lifetime.width(), lifetime.height(), out),
                Quantity.EXCEEDANCE_PROBABILITY, step);
    }

    /** The {@code q} quantile map, with all available processors. */
    public WaferMap quantileMap(WaferMap map, double q) {
        return quantileMap(map, q, Runtime.getRuntime().availableProcessors());
    }

    /**
     * The map of the {@code q} quantile of the equivalent trap density, cm⁻³ ({@link Quantity#DENSITY_QUANTILE};
     * q is recorded in the map's history), of a lifetime (µs) or PL-counts map, on {@code threads} threads (same
     * values on any number, and equal to {@link #quantileAt} pixel by pixel).
     */
    public WaferMap quantileMap(WaferMap map, double q, int threads) {
        if (!(q > 0 && q < 1)) {
            throw new InvalidValueException("quantile", "", "the quantile level q must lie in (0, 1) (got " + trapmap.shared.check.Checks.exact(q) + ")");
        }
        WaferMap lifetime = lifetimeOf(map);
        float[] tau = lifetime.raster().samples();
        float[] out = new float[tau.length];
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (float t : tau) {
            if (t >= TrapDensityConverter.LIFETIME_FLOOR_US && t <= MAX_TABLE_TAU_US) {
                lo = Math.min(lo, t);
                hi = Math.max(hi, t);
            }
        }
        QuantileTable table = lo <= hi ? model.quantileTable(q, lo, hi) : null;
        byRows(tau, lifetime.width(), threads, (from, to) -> {
            for (int i = from; i < to; i++) {
                out[i] = (float) (table != null ? table.quantile(tau[i]) : model.quantile(tau[i], q));
            }
        });
        Map<String, String> p = new LinkedHashMap<>(step.parameters());
        p.remove("threshold_cm3"); // a quantile does not depend on N*
        p.put("quantile", Double.toString(q));
        return lifetime.derive(FloatRaster.wrap(lifetime.width(), lifetime.height(), out), Quantity.DENSITY_QUANTILE,
                new ProcessingStep(step.operation(), p));
    }

    /** Largest lifetime a quantile table spans, µs (the table's own limit). */
    private static final double MAX_TABLE_TAU_US = 1e12;

    private static WaferMap lifetimeOf(WaferMap map) {
        Checks.notNull(map, "map");
        return switch (map.quantity()) {
            case EFFECTIVE_LIFETIME -> map;
            case PL_COUNTS -> MapConversion.lifetimeFromPl(map);
            default -> throw new InvalidValueException("quantity", "", "a " + map.quantity().key()
                    + " map has no exceedance probability; expected an effective-lifetime or PL-counts map");
        };
    }

    /** Work on the pixels {@code [from, to)}. */
    private interface Span {
        void run(int from, int to);
    }

    /** Runs {@code work} over every row, rows handed out in order to {@code threads} threads (the caller among them). */
    private static void byRows(float[] samples, int width, int threads, Span work) {
        if (width <= 0 || samples.length % width != 0) {
            throw new IllegalArgumentException("raster of " + samples.length + " pixels is not a whole number of"
                    + " rows of " + width);
        }
        int rows = samples.length / width;
        int n = Math.max(1, Math.min(threads, (rows + ROWS_PER_TASK - 1) / ROWS_PER_TASK));
        AtomicInteger next = new AtomicInteger();
        AtomicReference<Throwable> failure = new AtomicReference<>();
        Runnable[] workers = new Runnable[n];
        for (int t = 0; t < n; t++) {
            workers[t] = () -> {
                try {
                    for (int row0 = next.getAndAdd(ROWS_PER_TASK); row0 < rows && failure.get() == null;
                            row0 = next.getAndAdd(ROWS_PER_TASK)) {
                        work.run(row0 * width, Math.min(rows, row0 + ROWS_PER_TASK) * width);
                    }
                } catch (RuntimeException | Error e) {
                    failure.compareAndSet(null, e);
                }
            };
        }
        Workers.rethrow(Workers.runAll(List.of(workers), "exceedance-rows-", failure),
                "the exceedance map was interrupted");
    }

    /** The physics model the maps are computed with. */
    public ExceedanceModel model() {
        return model;
    }

    /** The threshold N*, cm⁻³. */
    public double thresholdPerCm3() {
        return model.thresholdPerCm3();
    }

    /** Number of Monte Carlo samples. */
    public int samples() {
        return model.samples();
    }

    /** The seed of the draws. */
    public long seed() {
        return seed;
    }

    /** The uncertainties drawn from. */
    public ConditionUncertainty uncertainty() {
        return uncertainty;
    }

    /** The defect's id. */
    public String defectId() {
        return defectId;
    }

    /** The history entry of the maps: the conversion's parameters with threshold, samples, seed, uncertainties. */
    public ProcessingStep step() {
        return step;
    }
}
