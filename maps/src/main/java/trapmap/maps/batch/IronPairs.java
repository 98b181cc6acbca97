package trapmap.maps.batch;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import trapmap.maps.compare.RegistrationOptions;
import trapmap.maps.io.NumberText;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.IronMapping;
import trapmap.maps.stats.MapStatistics;
import trapmap.shared.progress.ProgressListener;

/**
 * The iron figures of a batch's FeB-dissociation pairs ({@link IronPairRules}): for each file matching the FeB-state
 * glob the Fe_i-state partner is looked up among the batch's files, registered onto it and turned into an iron map
 * ({@link IronMapping}, conditions as for every map of the batch); the figures and their limits go into extra
 * columns of the FeB-state file's row. The Fe_i-state file's row names its partner. A file whose partner is not
 * among the batch's files gets {@code iron_status} {@code error} with the missing name, and fails.
 *
 * <p>The step for one file ({@link #evaluate(IronPairRules, Rules, String, String, PartnerLookup, MapsByName)}) takes
 * its partner lookup and map reading as arguments, so that files held elsewhere (e.g. a Spark job's) are paired and
 * judged by this same code.
 */
public final class IronPairs {
    /** The columns that are not numbers: the partner's file, the pair's status, its failed limits and notes. */
    public static final String PARTNER = "iron_partner";
    public static final String STATUS = "iron_status";
    public static final String FAILED = "iron_failed_rules";
    public static final String NOTE = "iron_note";

    private final IronPairRules rules;
    private final Rules base;
    private final WaferInspection.MapReader reader;
    private final List<Path> files;

    IronPairs(IronPairRules rules, Rules base, WaferInspection.MapReader reader, List<Path> files) {
        this.rules = rules;
        this.base = base;
        this.reader = reader;
        this.files = List.copyOf(files);
    }

    /** The extra columns: partner, status, median and P95 (and any other limited figure), crossover, notes. */
    public static List<String> columns(IronPairRules rules) {
        Set<String> c = new LinkedHashSet<>(List.of(PARTNER, STATUS, "iron_median_cm3", "iron_p95_cm3"));
        rules.limits().forEach(l -> c.add(l.figure()));
        c.addAll(List.of("iron_crossover_cm3", "iron_registration_score", FAILED, NOTE));
        return List.copyOf(c);
    }

    /** The iron columns of {@code file}'s row; empty when its name matches neither state's glob. */
    Map<String, String> evaluate(Path file) {
        return evaluate(rules, base, file.getFileName().toString(), file.toString(), partnerName -> {
            Path p = find(file, partnerName);
            return p == null ? null : p.toString();
        }, label -> reader.read(Path.of(label))).columns();
    }

    /** Finds the file of a partner by its name (without folder): its path or URI as reported, null when none. */
    @FunctionalInterface
    public interface PartnerLookup {
        String find(String partnerName);
    }

    /** Reads the map of a file given by its path or URI as {@link PartnerLookup} reports it. */
    @FunctionalInterface
    public interface MapsByName {
        WaferMap read(String file) throws java.io.IOException;
    }

    /**
     * The iron columns of one file's row.
     *
     * @param columns the columns as the batch writes them (text; empty when the file's name matches neither glob)
     * @param values  the numbers behind the numeric columns, unrounded (NaN: none); empty when no pair was judged
     */
    public record Evaluation(Map<String, String> columns, Map<String, Double> values) {
        public Evaluation {
            columns = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(columns));
            values = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(values));
        }
    }

    /**
     * The iron columns of the file named {@code name} (without folder), reported as {@code file}: for a FeB-state
     * file its pair is judged (both maps read with {@code maps}, the conditions of {@code base} applied), for a
     * Fe_i-state file its partner is named; the partner found by {@code partners} ({@code base}'s physics settings).
     */
    public static Evaluation evaluate(IronPairRules rules, Rules base, String name, String file,
                                      PartnerLookup partners, MapsByName maps) {
        Map<String, String> m = new LinkedHashMap<>();
        Map<String, Double> values = new LinkedHashMap<>();
        Optional<String> feiName = rules.feiNameFor(name);
        if (feiName.isPresent()) {
            String partner = partners.find(feiName.get());
            if (partner == null) {
                return new Evaluation(missing(m, feiName.get(), "Fe_i-state"), values);
            }
            m.put(PARTNER, partner);
            try {
                judge(m, values, rules, base, maps.read(file), maps.read(partner));
            } catch (Exception e) {
                m.put(STATUS, "error");
                m.put(FAILED, "iron");
                m.put(NOTE, "iron map of " + name + " and " + feiName.get() + ": " + e.getMessage());
                values.clear();
            }
            return new Evaluation(m, values);
        }
        Optional<String> febName = rules.febNameFor(name);
        if (febName.isPresent()) {
            String partner = partners.find(febName.get());
            if (partner == null) {
                return new Evaluation(missing(m, febName.get(), "FeB-state"), values);
            }
            m.put(PARTNER, partner);
            m.put(STATUS, "paired");
            m.put(NOTE, "iron figures on the FeB-state row of " + febName.get());
        }
        return new Evaluation(m, values);
    }

    private static void judge(Map<String, String> m, Map<String, Double> values, IronPairRules rules, Rules base,
                              WaferMap feb, WaferMap fei) {
        feb = feb.withConditions(base.applyTo(feb.conditions()));
        fei = fei.withConditions(base.applyTo(fei.conditions()));
        IronMapping.Result r = IronMapping.ofPair(feb, fei, RegistrationOptions.DEFAULTS, ConversionSettings.of(base.physics()),
                ProgressListener.NONE);
        float[] samples = finite(r.iron().raster().samples());
        List<String> failed = new ArrayList<>();
        double median = percentile(samples, 50);
        double p95 = percentile(samples, 95);
        m.put("iron_median_cm3", NumberText.sample(median));
        values.put("iron_median_cm3", median);
        m.put("iron_p95_cm3", NumberText.sample(p95));
        values.put("iron_p95_cm3", p95);
        for (IronPairRules.IronLimit l : rules.limits()) {
            double v = percentile(samples, l.percent());
            m.put(l.figure(), num(v));
            values.put(l.figure(), v);
            if (!l.holds(v)) {
                failed.add(l.figure());
            }
        }
        m.put("iron_crossover_cm3", num(r.crossoverPerCm3()));
        values.put("iron_crossover_cm3", r.crossoverPerCm3());
        double score = r.registration().registration().score();
        m.put("iron_registration_score", num(score));
        values.put("iron_registration_score", score);
        m.put(STATUS, failed.isEmpty() ? "pass" : "fail");
        m.put(FAILED, String.join(";", failed));
        List<String> notes = new ArrayList<>(r.registrationWarnings());
        r.warnings().forEach(w -> notes.add(w.message()));
        if (!r.inconsistentNote().isEmpty()) {
            notes.add(r.inconsistentNote());
        }
        if (samples.length == 0) {
            notes.add("no pixel with an iron value");
        }
        m.put(NOTE, String.join("; ", notes));
    }

    private static Map<String, String> missing(Map<String, String> m, String partnerName, String state) {
        m.put(STATUS, "error");
        m.put(FAILED, "iron");
        m.put(NOTE, "no " + state + " partner " + partnerName + " among the inspected files");
        return m;
    }

    /** The batch file named {@code name}, preferring one in {@code file}'s folder; null when none. */
    private Path find(Path file, String name) {
        Path other = null;
        for (Path f : files) {
            if (f.getFileName().toString().equals(name)) {
                if (f.toAbsolutePath().getParent().equals(file.toAbsolutePath().getParent())) {
                    return f;
                }
                other = other == null ? f : other;
            }
        }
        return other;
    }

    /**
     * {@code row} with the iron columns merged in: a passing wafer whose iron pair fails or is in error fails, its
     * failed iron figures (or {@code iron}) added to {@code failed_rules} and its grade the profile's fail grade.
     */
    public static void merge(Map<String, String> row, Map<String, String> iron, Rules rules) {
        row.putAll(iron);
        String st = iron.getOrDefault(STATUS, "");
        if ((st.equals("fail") || st.equals("error")) && !row.getOrDefault("status", "").equals("error")) {
            row.put("status", "fail");
            String failed = row.getOrDefault("failed_rules", "");
            String more = iron.getOrDefault(FAILED, "");
            row.put("failed_rules", failed.isEmpty() ? more : failed + ";" + more);
            row.put("graded_down_by", "");
            String profile = row.getOrDefault("profile", "");
            String failGrade = rules.allProfiles().stream().filter(p -> p.name().equals(profile)).findFirst()
                    .map(Rules.Profile::failGrade).orElse(rules.failGrade());
            row.put("grade", failGrade);
        }
    }

    private static float[] finite(float[] s) {
        float[] out = new float[s.length];
        int n = 0;
        for (float v : s) {
            if (Float.isFinite(v)) {
                out[n++] = v;
            }
        }
        return java.util.Arrays.copyOf(out, n);
    }

    private static double percentile(float[] values, double percent) {
        return values.length == 0 ? Double.NaN
                : MapStatistics.percentiles(values.clone(), values.length, new double[] {percent})[0];
    }

    private static String num(double v) {
        return NumberText.of(v);
    }
}
