package trapmap.maps.process;

import java.util.Collections;
import java.util.EnumMap;
import java.util.EnumSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import trapmap.maps.compare.MapRegistration;
import trapmap.maps.compare.RegistrationOptions;
import trapmap.maps.compare.RegistrationReport;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.iron.IronImaging;
import trapmap.physics.iron.IronResult;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;

/**
 * Interstitial-iron maps from a pair of effective-lifetime maps of one p-type wafer: one with the iron paired to
 * boron (FeB state, e.g. after 24 h in the dark) and one right after dissociating the pairs (Fe_i state, e.g. after
 * strong illumination). Per pixel, {@link IronImaging} (Macdonald, Geerligs &amp; Azzizi, JAP 95, 1021 (2004)) gives
 * <pre>
 * [Fe_i] = C(Δn, N_A, T)·(1/τ_Fei − 1/τ_FeB),   C = 1/(χ_Fei − χ_FeB)
 * </pre>
 * at the maps' fixed injection level Δn (both maps must be measured at the same Δn). Every pixel gets a
 * {@link IronStatus}; crossover and near-crossover pixels are marked, and the statistics are over the pixels with a
 * value (a {@link IronStatus#BELOW_LIMIT} pixel holds the detection limit, an upper bound).
 */
public final class IronMapping {
    /** The caution of the method, shown beside every iron map. */
    public static final String CAUTION = "Assumes complete FeB dissociation, all other recombination unchanged and the"
            + " same injection in both measurements; near the Fe_i/FeB crossover injection the iron signal vanishes.";

    /** Percentiles of the statistics: P5, P25, P75, P90, P95. */
    private static final StatisticsRequest PERCENTILES = StatisticsRequest.of(new double[] {5, 25, 75, 90, 95});

    /** What a pixel of the iron map is; the code is the value of the status map. */
    public enum IronStatus {
        /** Iron detected: the value is [Fe_i]. */
        OK(0, "ok"),
        /**
         * No detectable iron (the lifetime changed by less than the resolution): the value is the detection limit,
         * an upper bound.
         */
        BELOW_LIMIT(1, "below-limit"),
        /**
         * Δn within a factor {@value IronImaging#WARNING_FACTOR} of the crossover: a value is given but the
         * prefactor C is large and uncertain.
         */
        NEAR_CROSSOVER(2, "near-crossover"),
        /** Δn within ±10 % of the crossover: the method has no signal (NaN). */
        CROSSOVER(3, "crossover"),
        /** A lifetime is zero, negative or infinite (NaN). */
        INVALID(4, "invalid"),
        /** Either map has no data here (NaN). */
        NO_DATA(5, "no-data"),
        /**
         * The lifetime moved the way dissociation cannot move it at this Δn (a fall above the crossover, a rise below
         * it) by more than the resolution: swapped maps or other recombination changed; no value (NaN).
         */
        INCONSISTENT(6, "inconsistent");

        private final int code;
        private final String key;

        IronStatus(int code, String key) {
            this.code = code;
            this.key = key;
        }

        /** Value in the status map. */
        public int code() {
            return code;
        }

        /** Lower-case key for results and JSON. */
        public String key() {
            return key;
        }
    }

    /**
     * An iron map with its status map and figures.
     *
     * @param iron            [Fe_i] per pixel ({@link Quantity#IRON_DENSITY}, cm⁻³); NaN where there is no value
     * @param status          {@link IronStatus#code()} per pixel ({@link Quantity#STATUS})
     * @param statistics      statistics of the iron map over the pixels with a value (and the mask, when given)
     * @param counts          pixels per status (all statuses present, zero when none)
     * @param injectionPerCm3 the Δn of both measurements, cm⁻³
     * @param crossoverPerCm3 the Fe_i/FeB crossover Δn, cm⁻³ (NaN when there is none)
     * @param warnings        cautions of the method at this injection
     * @param registration    how the Fe_i-state map was placed on the FeB-state map (null when the maps were given
     *                        on one grid)
     */
    public record Result(WaferMap iron, WaferMap status, MapStatistics statistics, Map<IronStatus, Integer> counts,
                         double injectionPerCm3, double crossoverPerCm3, Set<ConversionWarning> warnings,
                         RegistrationReport registration) {
        public Result {
            counts = Collections.unmodifiableMap(new EnumMap<>(counts));
            warnings = Collections.unmodifiableSet(warnings.isEmpty() ? EnumSet.noneOf(ConversionWarning.class)
                    : EnumSet.copyOf(warnings));
        }

        /** Median [Fe_i] over the pixels with a value, cm⁻³ (NaN when none). */
        public double medianPerCm3() {
            return statistics.count() == 0 ? Double.NaN : statistics.median();
        }

        /** 95th percentile of [Fe_i] over the pixels with a value, cm⁻³ (NaN when none). */
        public double p95PerCm3() {
            return statistics.count() == 0 ? Double.NaN : statistics.percentile(95);
        }

        /** Pixels with this status. */
        public int count(IronStatus s) {
            return counts.get(s);
        }

        /** True when Δn lies within a factor 2 of the crossover. */
        public boolean nearCrossover() {
            return warnings.contains(ConversionWarning.NEAR_IRON_CROSSOVER);
        }

        /**
         * A one-line note when some pixels are {@link IronStatus#INCONSISTENT} (empty otherwise): how many, and what
         * the lifetime should have done at this Δn.
         */
        public String inconsistentNote() {
            int n = count(IronStatus.INCONSISTENT);
            if (n == 0) {
                return "";
            }
            boolean above = !Double.isNaN(crossoverPerCm3) && injectionPerCm3 > crossoverPerCm3;
            return n + " pixel(s) inconsistent: at Δn = " + String.format(Locale.ROOT, "%.3g", injectionPerCm3)
                    .replaceFirst("\\.?0*e\\+?", "e")
                    + " cm^-3, " + (above ? "above" : "below") + " the Fe_i/FeB crossover, dissociation can only "
                    + (above ? "raise" : "lower") + " the lifetime, but there it moved the other way (swapped maps,"
                    + " or other recombination changed)";
        }

        /** The registration warnings, empty when the maps were not registered or raised none. */
        public List<String> registrationWarnings() {
            return registration == null ? List.of() : registration.warnings();
        }
    }

    private IronMapping() {
    }

    /**
     * Registers the Fe_i-state map onto the FeB-state map ({@link MapRegistration#registerChecked}; null
     * {@code registration}: the maps must lie on one grid already) and maps the iron.
     *
     * @throws InvalidValueException as {@link #map}, or when unregistered maps differ in size
     */
    public static Result ofPair(WaferMap febState, WaferMap feiState, RegistrationOptions registration,
                                ConversionSettings settings, ProgressListener progress) {
        Checks.notNull(febState, "febState");
        Checks.notNull(feiState, "feiState");
        RegistrationReport report;
        WaferMap fei;
        if (registration == null) {
            if (febState.width() != feiState.width() || febState.height() != feiState.height()) {
                throw new InvalidValueException("feiState", "px", "without registration the maps must be of one"
                        + " size, but the FeB-state map is " + febState.width() + "x" + febState.height()
                        + " px and the Fe_i-state map " + feiState.width() + "x" + feiState.height() + " px");
            }
            fei = feiState.withGrid(febState.grid());
            report = MapRegistration.unregistered(febState, fei);
        } else {
            report = MapRegistration.registerChecked(febState, feiState, registration,
                    progress == null ? ProgressListener.NONE : progress);
            fei = MapRegistration.apply(febState, feiState, report.registration());
        }
        Result r = map(febState, fei, settings, null);
        return new Result(r.iron(), r.status(), r.statistics(), r.counts(), r.injectionPerCm3(),
                r.crossoverPerCm3(), r.warnings(), report);
    }

    /**
     * The iron map of an FeB-state and an Fe_i-state lifetime map on one grid.
     *
     * @param febState       effective lifetime with the iron in FeB pairs, µs
     * @param feiState       effective lifetime after dissociation, on {@code febState}'s grid, µs
     * @param settings       model choices (temperature conventions, detection resolution); null: defaults
     * @param statisticsMask pixels the statistics count (null: all with a value)
     * @throws InvalidValueException when the maps are not lifetimes or lie on different grids, the doping is not
     *                               p-type or unknown, or the maps are not measured at one fixed injection level
     */
    public static Result map(WaferMap febState, WaferMap feiState, ConversionSettings settings, Mask statisticsMask) {
        Checks.notNull(febState, "febState");
        Checks.notNull(feiState, "feiState");
        ConversionSettings s = settings == null ? ConversionSettings.DEFAULTS : settings;
        if (febState.quantity() != Quantity.EFFECTIVE_LIFETIME || feiState.quantity() != Quantity.EFFECTIVE_LIFETIME) {
            throw new InvalidValueException("quantity", "", "iron imaging needs two effective-lifetime maps (µs), not "
                    + febState.quantity().key() + " and " + feiState.quantity().key());
        }
        if (!febState.grid().equals(feiState.grid())) {
            throw new InvalidValueException("feiState", "", "the Fe_i-state map must lie on the FeB-state map's grid;"
                    + " register it first");
        }
        Conditions cond = MapConversion.physicsConditions(febState.conditions(), s);
        if (!(cond.injection() instanceof Injection.Fixed fixed)) {
            throw new InvalidValueException("injection", "cm^-3", "iron imaging needs both maps measured at one fixed"
                    + " injection level (cm^-3); the FeB-state map gives a generation rate");
        }
        double dn = fixed.excessPerCm3();
        Double feiDn = feiState.conditions().injectionPerCm3();
        if (feiDn != null && Math.abs(feiDn - dn) > 1e-6 * dn) {
            throw new InvalidValueException("injection", "cm^-3", String.format(Locale.ROOT, "the FeB-state map was"
                    + " measured at %.4g cm^-3 but the Fe_i-state map at %.4g cm^-3; iron imaging needs the same"
                    + " injection in both", dn, feiDn));
        }
        IronImaging imaging = new IronImaging(cond.doping(), cond.silicon(),
                trapmap.physics.defect.DefectLibrary.byId("fe-i"), trapmap.physics.defect.DefectLibrary.byId("fe-b"),
                s.detectionResolution());
        float[] tb = febState.raster().samples();
        float[] ta = feiState.raster().samples();
        float[] fe = new float[tb.length];
        float[] status = new float[tb.length];
        int[] counts = new int[IronStatus.values().length];
        Set<ConversionWarning> warnings = EnumSet.noneOf(ConversionWarning.class);
        for (int i = 0; i < fe.length; i++) {
            IronStatus st;
            if (Float.isNaN(tb[i]) || Float.isNaN(ta[i])) {
                fe[i] = Float.NaN;
                st = IronStatus.NO_DATA;
            } else {
                IronResult r = imaging.evaluate(tb[i], ta[i], dn);
                warnings.addAll(r.warnings());
                boolean near = r.warnings().contains(ConversionWarning.NEAR_IRON_CROSSOVER);
                if (r.status() == PixelStatus.INCONSISTENT) {
                    fe[i] = Float.NaN;
                    st = IronStatus.INCONSISTENT;
                } else if (r.status() == PixelStatus.INVALID) {
                    fe[i] = Float.NaN;
                    st = near && tb[i] > 0 && ta[i] > 0 && Double.isFinite(tb[i]) && Double.isFinite(ta[i])
                            ? IronStatus.CROSSOVER : IronStatus.INVALID;
                } else {
                    fe[i] = (float) r.ironPerCm3();
                    st = near ? IronStatus.NEAR_CROSSOVER
                            : r.status() == PixelStatus.BELOW_LIMIT ? IronStatus.BELOW_LIMIT : IronStatus.OK;
                }
            }
            status[i] = st.code();
            counts[st.ordinal()]++;
        }
        String feiId = feiState.waferId().isEmpty() ? feiState.provenance().source() : feiState.waferId();
        ProcessingStep step = ProcessingStep.of("iron", "method", "Macdonald, Geerligs & Azzizi, JAP 95, 1021 (2004)",
                "formula", "[Fe_i] = (1/tau_Fei - 1/tau_FeB) / (chi_Fei - chi_FeB)",
                "injection_cm3", String.format(Locale.ROOT, "%.6g", dn),
                "crossover_cm3", String.format(Locale.ROOT, "%.6g", imaging.crossoverPerCm3()),
                "fe_i_state", feiId);
        java.util.Map<String, String> withPhysics = new java.util.LinkedHashMap<>(step.parameters());
        s.physics().describe().forEach((k, v) -> withPhysics.put("physics." + k, v));
        step = new ProcessingStep(step.operation(), withPhysics);
        WaferMap iron = febState.derive(FloatRaster.wrap(febState.width(), febState.height(), fe),
                Quantity.IRON_DENSITY, step);
        WaferMap statusMap = febState.derive(FloatRaster.wrap(febState.width(), febState.height(), status),
                Quantity.STATUS, ProcessingStep.of("iron-status", "codes", codes(), "fe_i_state", feiId));
        MapStatistics stats = MapStatistics.of(iron, statisticsMask, PERCENTILES);
        Map<IronStatus, Integer> byStatus = new EnumMap<>(IronStatus.class);
        for (IronStatus st : IronStatus.values()) {
            byStatus.put(st, counts[st.ordinal()]);
        }
        return new Result(iron, statusMap, stats, byStatus, dn, imaging.crossoverPerCm3(), warnings, null);
    }

    /** The status codes as written into the status map's history, e.g. {@code 0 ok, 1 below-limit, …}. */
    public static String codes() {
        StringBuilder b = new StringBuilder();
        for (IronStatus s : IronStatus.values()) {
            b.append(b.length() == 0 ? "" : ", ").append(s.code()).append(' ').append(s.key());
        }
        return b.toString();
    }
}
