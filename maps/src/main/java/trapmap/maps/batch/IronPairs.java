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
 */
final class IronPairs {
    static final String PARTNER = "iron_partner";
    static final String STATUS = "iron_status";
    static final String FAILED = "iron_failed_rules";
    static final String NOTE = "iron_note";

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
    static List<String> columns(IronPairRules rules) {
        Set<String> c = new LinkedHashSet<>(List.of(PARTNER, STATUS, "iron_median_cm3", "iron_p95_cm3"));
        rules.limits().forEach(l -> c.add(l.figure()));
        c.addAll(List.of("iron_crossover_cm3", "iron_registration_score", FAILED, NOTE));
        return List.copyOf(c);
    }

    /** The iron columns of {@code file}'s row; empty when its name matches neither state's glob. */
    Map<String, String> evaluate(Path file) {
        String name = file.getFileName().toString();
        Map<String, String> m = new LinkedHashMap<>();
        Optional<String> feiName = rules.feiNameFor(name);
        if (feiName.isPresent()) {
            Path partner = find(file, feiName.get());
            if (partner == null) {
                return missing(m, feiName.get(), "Fe_i-state");
            }
            m.put(PARTNER, partner.toString());
            try {
                judge(m, reader.read(file), reader.read(partner));
            } catch (Exception e) {
                m.put(STATUS, "error");
                m.put(FAILED, "iron");
                m.put(NOTE, "iron map of " + name + " and " + partner.getFileName() + ": " + e.getMessage());
            }
            return m;
        }
        Optional<String> febName = rules.febNameFor(name);
        if (febName.isPresent()) {
            Path partner = find(file, febName.get());
            if (partner == null) {
                return missing(m, febName.get(), "FeB-state");
            }
            m.put(PARTNER, partner.toString());
            m.put(STATUS, "paired");
            m.put(NOTE, "iron figures on the FeB-state row of " + partner.getFileName());
        }
        return m;
    }

    private void judge(Map<String, String> m, WaferMap feb, WaferMap fei) {
        feb = feb.withConditions(base.applyTo(feb.conditions()));
        fei = fei.withConditions(base.applyTo(fei.conditions()));
        IronMapping.Result r = IronMapping.ofPair(feb, fei, RegistrationOptions.DEFAULTS, ConversionSettings.of(base.physics()),
                ProgressListener.NONE);
        float[] values = finite(r.iron().raster().samples());
        List<String> failed = new ArrayList<>();
        m.put("iron_median_cm3", NumberText.sample(percentile(values, 50)));
        m.put("iron_p95_cm3", NumberText.sample(percentile(values, 95)));
        for (IronPairRules.IronLimit l : rules.limits()) {
            double v = percentile(values, l.percent());
            m.put(l.figure(), num(v));
            if (!l.holds(v)) {
                failed.add(l.figure());
            }
        }
        m.put("iron_crossover_cm3", num(r.crossoverPerCm3()));
        m.put("iron_registration_score", num(r.registration().registration().score()));
        m.put(STATUS, failed.isEmpty() ? "pass" : "fail");
        m.put(FAILED, String.join(";", failed));
        List<String> notes = new ArrayList<>(r.registrationWarnings());
        r.warnings().forEach(w -> notes.add(w.message()));
        if (!r.inconsistentNote().isEmpty()) {
            notes.add(r.inconsistentNote());
        }
        if (values.length == 0) {
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
    static void merge(Map<String, String> row, Map<String, String> iron, Rules rules) {
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
