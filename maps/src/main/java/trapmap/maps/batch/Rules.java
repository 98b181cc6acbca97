package trapmap.maps.batch;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Path;
import java.time.Instant;
import java.time.LocalDate;
import java.time.ZoneOffset;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.EnumSet;
import java.util.Iterator;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;
import java.util.function.ToDoubleFunction;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.NumberText;
import trapmap.maps.io.PhysicsSettingsFile;
import trapmap.maps.io.UncertaintySettings;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.RunRule;
import trapmap.maps.trend.TrendSettings;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.Doping;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.text.TextLimits;

/**
 * The inspection rules of a batch, read from a JSON file and checked completely before any wafer is read. The
 * schema is described in the README ("Batch inspection"); every key is known, every number has its unit in its
 * name, and an error names the field and its unit.
 *
 * @param conditions      measurement conditions for maps whose sidecar lacks them (all fields may be null)
 * @param override        true when {@code conditions} replace the sidecar's values instead of filling gaps
 * @param defectId        defect for trap-density figures and flags, or null when none is needed
 * @param edgeExclusionMm band along the wafer edge left out of every figure, mm
 * @param waferFormat     standard outline, or null to fit the outline to each map
 * @param edgeBandMm      width of the edge band of {@code edge_to_centre_ratio}, mm (inside the edge exclusion)
 * @param flag            what counts as a flagged pixel and region
 * @param limits          pass/fail limits; a wafer passes when every figure is within its limits
 * @param grades          grades of passing wafers, first matching wins
 * @param failGrade       grade of a wafer that fails a limit ("" for none)
 * @param profiles        other ways of judging the maps they match (their defect, flag, limits, grades)
 * @param physics         the physics settings every wafer is converted with (the {@code physics} block)
 * @param trend           the trend followed over a results store (the {@code trend} block), empty when none: then
 *                        no trend page and no signal alarm
 */
public record Rules(MeasurementConditions conditions, boolean override, String defectId, double edgeExclusionMm,
                    WaferFormat waferFormat, double edgeBandMm, Flag flag, List<Limit> limits, List<Grade> grades,
                    String failGrade, List<Profile> profiles, PhysicsSettings physics,
                    Optional<TrendSettings> trend) {

    /** The rules' top-level key of the {@link TrendSettings} block. */
    public static final String TREND_KEY = "trend";
    /** Default width of the edge band of {@code edge_to_centre_ratio}, mm. */
    public static final double DEFAULT_EDGE_BAND_MM = 10;
    /** Name of the profile made of the top-level defect, flag, limits and grades. */
    public static final String DEFAULT_PROFILE = "default";

    public Rules {
        limits = List.copyOf(limits);
        grades = List.copyOf(grades);
        failGrade = failGrade == null ? "" : failGrade;
        profiles = List.copyOf(profiles);
        physics = physics == null ? PhysicsSettings.DEFAULTS : physics;
        trend = trend == null ? Optional.empty() : trend;
    }

    /** Rules without a {@code trend} block. */
    public Rules(MeasurementConditions conditions, boolean override, String defectId, double edgeExclusionMm,
                 WaferFormat waferFormat, double edgeBandMm, Flag flag, List<Limit> limits, List<Grade> grades,
                 String failGrade, List<Profile> profiles, PhysicsSettings physics) {
        this(conditions, override, defectId, edgeExclusionMm, waferFormat, edgeBandMm, flag, limits, grades,
                failGrade, profiles, physics, Optional.empty());
    }

    /** The same rules with other physics settings (a {@code --physics} file replaces the rules' block). */
    public Rules withPhysics(PhysicsSettings p) {
        return new Rules(conditions, override, defectId, edgeExclusionMm, waferFormat, edgeBandMm, flag, limits,
                grades, failGrade, profiles, p, trend);
    }

    /**
     * Which maps a profile judges: every given condition must hold (none given: never used).
     *
     * @param type     conductivity type of the map's doping (after the rules' conditions), or null for any
     * @param families wafer families (format ids, round size families such as {@code round-200} that take both
     *                 marks, {@code fitted}, {@code unfitted}; see {@link WaferFormat#familyMatches}), or empty for
     *                 any
     * @param file     glob on the file name (not the folder), or null for any
     */
    public record Match(ConductivityType type, List<String> families, String file) {
        public Match {
            families = List.copyOf(families);
        }

        /** True when a map of this file name, type and family meets every condition. */
        public boolean matches(String fileName, ConductivityType mapType, String family) {
            return (type == null || type == mapType)
                    && (families.isEmpty() || families.stream().anyMatch(f -> WaferFormat.familyMatches(f, family)))
                    && (file == null || FileGlob.compile(file).matches(fileName));
        }
    }

    /**
     * How one kind of wafer is judged: the defect its trap densities are computed for, what is flagged, the
     * pass/fail limits and the grades. The top level of the rules is the {@value #DEFAULT_PROFILE} profile; entries
     * of {@code profiles} replace the keys they give for the maps they match.
     *
     * @param name      the profile's name, reported per wafer
     * @param match     the maps it judges (null for the default profile)
     * @param defectId  defect for trap-density flags and figures, or null
     * @param flag      flagged pixels and regions
     * @param limits    pass/fail limits
     * @param grades    grades of passing wafers, first matching wins
     * @param failGrade grade of a failed wafer ("" for none)
     * @param stack     the injection stack its wafers are measured as (defect identification), or null for none
     */
    public record Profile(String name, Match match, String defectId, Flag flag, List<Limit> limits,
                          List<Grade> grades, String failGrade, StackRules stack) {
        public Profile {
            limits = List.copyOf(limits);
            grades = List.copyOf(grades);
        }

        /** A profile without an injection stack. */
        public Profile(String name, Match match, String defectId, Flag flag, List<Limit> limits, List<Grade> grades,
                       String failGrade) {
            this(name, match, defectId, flag, limits, grades, failGrade, null);
        }

        /** True when a limit or grade names a figure of an injection stack. */
        boolean usesStackFigures() {
            return limits.stream().anyMatch(l -> l.figure().needsStack())
                    || grades.stream().flatMap(g -> g.when().stream()).anyMatch(l -> l.figure().needsStack());
        }

        /** True when a trap-density map is needed: a trap-density flag or figure. */
        public boolean needsTrapDensity() {
            return flag.quantity() == FlagQuantity.TRAP_DENSITY
                    || limits.stream().anyMatch(l -> l.figure().needsTrapDensity())
                    || grades.stream().flatMap(g -> g.when().stream()).anyMatch(l -> l.figure().needsTrapDensity());
        }

        /** Every figure this profile uses: the always-reported ones and those its limits and grades name. */
        public List<Figure> figures() {
            Set<Figure> s = new LinkedHashSet<>();
            s.add(Figure.parse("harmonic_mean_lifetime_us"));
            s.add(Figure.parse("median_lifetime_us"));
            limits.forEach(l -> s.add(l.figure()));
            grades.forEach(g -> g.when().forEach(l -> s.add(l.figure())));
            s.add(Figure.parse("flagged_area_fraction"));
            s.add(Figure.parse("largest_region_mm2"));
            s.add(Figure.parse(Figure.INVALID_AREA_FRACTION));
            if (needsTrapDensity()) {
                s.add(Figure.parse("below_limit_area_fraction"));
            }
            if (stack != null) {
                s.add(Figure.parse(Figure.BEST_DEFECT_AREA_FRACTION));
                s.add(Figure.parse(Figure.NO_SINGLE_DEFECT_AREA_FRACTION));
            }
            return List.copyOf(s);
        }

        /**
         * True when the profile's limits bound {@code invalid_area_fraction}; otherwise a wafer fails above
         * {@link trapmap.maps.stats.InvalidArea#DEFAULT_LIMIT} (the program's default limit).
         */
        public boolean limitsInvalidArea() {
            return limits.stream().anyMatch(l -> l.figure().kind() == Figure.Kind.INVALID_AREA_FRACTION);
        }

        /**
         * The limit on {@code invalid_area_fraction} the profile is judged by: its own, or the program's default,
         * at most {@link trapmap.maps.stats.InvalidArea#DEFAULT_LIMIT}.
         */
        public Limit invalidAreaLimit() {
            return limits.stream().filter(l -> l.figure().kind() == Figure.Kind.INVALID_AREA_FRACTION).findFirst()
                    .orElse(new Limit(Figure.parse(Figure.INVALID_AREA_FRACTION), Double.NaN,
                            trapmap.maps.stats.InvalidArea.DEFAULT_LIMIT));
        }

        /**
         * The grade of a wafer with these figures: {@link #failGrade} when it failed a limit, otherwise the first
         * grade whose limits hold ("" when none does). A failed wafer never gets a passing grade.
         */
        public String grade(boolean failed, ToDoubleFunction<Figure> value) {
            if (failed) {
                return failGrade;
            }
            for (Grade g : grades) {
                if (g.when().stream().allMatch(l -> l.holds(value.applyAsDouble(l.figure())))) {
                    return g.grade();
                }
            }
            return "";
        }

        /**
         * For a passing wafer, the figures that kept it from a better grade than {@code grade}: of each grade listed
         * before it, the figures outside that grade's limits (each named once, in order of appearance).
         */
        public List<String> missedBy(String grade, ToDoubleFunction<Figure> value) {
            Set<String> out = new LinkedHashSet<>();
            for (Grade g : grades) {
                if (g.grade().equals(grade)) {
                    break;
                }
                g.when().stream().filter(l -> !l.holds(value.applyAsDouble(l.figure())))
                        .forEach(l -> out.add(l.figure().name()));
            }
            return List.copyOf(out);
        }
    }

    /** The top-level defect, flag, limits and grades as a profile. */
    public Profile defaultProfile() {
        return new Profile(DEFAULT_PROFILE, null, defectId, flag, limits, grades, failGrade);
    }

    /** The default profile, then the {@code profiles} in file order. */
    public List<Profile> allProfiles() {
        List<Profile> all = new ArrayList<>();
        all.add(defaultProfile());
        all.addAll(profiles);
        return all;
    }

    /** The first profile that matches the map, else the default profile. */
    public Profile profileFor(String fileName, ConductivityType type, String family) {
        for (Profile p : profiles) {
            if (p.match().matches(fileName, type, family)) {
                return p;
            }
        }
        return defaultProfile();
    }

    /** Which side of the threshold is flagged: below for lifetimes, above for trap densities. */
    public enum FlagQuantity {
        LIFETIME("lifetime", "us"), TRAP_DENSITY("trap-density", "cm^-3");

        private final String key;
        private final String unit;

        FlagQuantity(String key, String unit) {
            this.key = key;
            this.unit = unit;
        }

        public String key() {
            return key;
        }

        public String unit() {
            return unit;
        }
    }

    /**
     * Flagged pixels: lifetime below, or trap density above, {@code threshold}; flagged regions: 8-connected groups
     * of them of at least {@code minAreaMm2}.
     *
     * @param quantity  the map the threshold applies to
     * @param threshold µs for lifetime, cm^-3 for trap density
     * @param minAreaMm2 smallest region counted, mm²
     * @param belowLimit what the profile's trap-density flag and figures do with pixels below the detection limit
     * @param confidence  for a trap-density flag, flag the pixels whose probability of exceeding the threshold is at
     *                    least this (0 &lt; c ≤ 1), over the uncertainties of {@code uncertainty}
     *                    ({@link trapmap.maps.process.ExceedanceMaps}); 0: none, flag the nominal density (rules
     *                    key {@code "confidence"})
     * @param uncertainty what the probability is drawn with (the rules' {@code physics.uncertainty} block)
     */
    public record Flag(FlagQuantity quantity, double threshold, double minAreaMm2, BelowLimit belowLimit,
                       double confidence, UncertaintySettings uncertainty) {
        public Flag {
            Objects.requireNonNull(belowLimit, "belowLimit");
            Objects.requireNonNull(uncertainty, "uncertainty");
            if (confidence != 0 && (quantity != FlagQuantity.TRAP_DENSITY || !(confidence > 0 && confidence <= 1))) {
                throw new IllegalArgumentException("a flag confidence needs a trap-density flag and lies in (0, 1]");
            }
        }

        /** A flag of the nominal value (no confidence). */
        public Flag(FlagQuantity quantity, double threshold, double minAreaMm2, BelowLimit belowLimit) {
            this(quantity, threshold, minAreaMm2, belowLimit, 0, UncertaintySettings.DEFAULTS);
        }

        /** A flag that leaves pixels below the detection limit out ({@link BelowLimit#EXCLUDE}). */
        public Flag(FlagQuantity quantity, double threshold, double minAreaMm2) {
            this(quantity, threshold, minAreaMm2, BelowLimit.EXCLUDE);
        }

        /**
         * The unit of the values of the flagged regions (their peak and mean): the flag's, or "us" for a flag with a
         * confidence, whose regions are found on the lifetimes.
         */
        public String regionUnit() {
            return confident() ? FlagQuantity.LIFETIME.unit() : quantity.unit();
        }

        /** True when the flag judges the probability of exceeding its threshold, not the nominal density. */
        public boolean confident() {
            return confidence > 0;
        }

        /**
         * The flag in words, e.g. "trap density above 1e12 cm^-3" or "P(trap density above 1e12 cm^-3) at least
         * 0.95": what the results and reports name.
         */
        public String describe() {
            String t = (quantity == FlagQuantity.LIFETIME ? "lifetime below " : "trap density above ")
                    + NumberText.of(threshold) + " " + quantity.unit();
            return confident() ? "P(" + t + ") at least " + NumberText.of(confidence) : t;
        }

        /** The region criteria of this flag: lifetimes below, or trap densities above, the threshold. */
        public RegionCriteria criteria() {
            return quantity == FlagQuantity.LIFETIME ? RegionCriteria.below(threshold, minAreaMm2)
                    : RegionCriteria.above(threshold, minAreaMm2);
        }
    }

    /**
     * What the trap-density flag and figures of a profile do with pixels below the detection limit (whose value is
     * the detection limit, an upper bound, not a measured density): the rules {@code flag} key
     * {@code "below_limit"}.
     */
    public enum BelowLimit {
        /** Left out of trap-density flags, regions and percentiles (default); counted in below_limit_area_fraction. */
        EXCLUDE("exclude"),
        /** Counted at their bound, the detection limit (a conservative reading). */
        AT_BOUND("at_bound");

        private final String key;

        BelowLimit(String key) {
            this.key = key;
        }

        /** The value in the rules file. */
        public String key() {
            return key;
        }
    }

    /**
     * Limits on one figure; NaN means no limit on that side. A figure that cannot be computed (NaN) fails every
     * limit.
     */
    public record Limit(Figure figure, double min, double max) {
        public boolean holds(double value) {
            if (Double.isNaN(value)) {
                return false;
            }
            return (Double.isNaN(min) || value >= min) && (Double.isNaN(max) || value <= max);
        }
    }

    /** A grade and the limits a wafer must meet to get it (none: always). */
    public record Grade(String grade, List<Limit> when) {
        public Grade {
            when = List.copyOf(when);
        }
    }

    /**
     * The trend a batch summary charts when the batch writes into a results store: the rules' {@code trend} block,
     * else {@link #defaultTrend()}. The watch's signal alarm uses the block only ({@link #trend()}).
     */
    public TrendSettings summaryTrend() {
        return trend.orElseGet(this::defaultTrend);
    }

    /**
     * The trend of rules without a {@code trend} block: the first figure the default profile limits (else its first
     * figure), by lot, the first {@value trapmap.maps.trend.Baseline#DEFAULT_COUNT} charted wafers as the baseline, no
     * alarm rule.
     */
    public TrendSettings defaultTrend() {
        String figure = limits.isEmpty() ? defaultProfile().figures().get(0).name()
                : limits.get(0).figure().name();
        return new TrendSettings(figure, TrendSettings.DEFAULT_BY,
                trapmap.maps.trend.Baseline.first(trapmap.maps.trend.Baseline.DEFAULT_COUNT), java.util.Set.of());
    }

    /**
     * Every figure of every profile, in the order they first appear (default profile first); the CSV columns follow
     * this order.
     */
    public List<Figure> figures() {
        Set<Figure> s = new LinkedHashSet<>();
        allProfiles().forEach(p -> s.addAll(p.figures()));
        return List.copyOf(s);
    }

    /**
     * The maps a file of this name may be judged with: the most levels of a profile stack whose first level it
     * matches (its profile may still not match the map), else 1. The batch reserves memory for that many maps.
     */
    public int stackLevels(String fileName) {
        int most = 1;
        for (Profile p : profiles) {
            if (p.stack() != null && p.stack().judges(fileName)) {
                most = Math.max(most, p.stack().levels().size());
            }
        }
        return most;
    }

    /** True when the default profile needs a trap-density map (a trap-density flag or figure). */
    public boolean needsTrapDensity() {
        return defaultProfile().needsTrapDensity();
    }

    /** The conditions a map is converted with: the sidecar's, gaps filled from (or, with override, replaced by) these. */
    public MeasurementConditions applyTo(MeasurementConditions fromFile) {
        boolean rulesHaveExcitation = conditions.injectionPerCm3() != null
                || conditions.generationPerCm3PerS() != null;
        boolean fileHasExcitation = fromFile.injectionPerCm3() != null || fromFile.generationPerCm3PerS() != null;
        if (override) {
            MeasurementConditions base = rulesHaveExcitation
                    ? fromFile.withInjection(null).withGeneration(null) : fromFile;
            return base.overriddenBy(conditions);
        }
        MeasurementConditions gaps = fileHasExcitation
                ? conditions.withInjection(null).withGeneration(null) : conditions;
        return gaps.overriddenBy(fromFile);
    }

    // ---- reading -------------------------------------------------------------------------------------------

    private static final ObjectMapper JSON = new ObjectMapper()
            .enable(JsonParser.Feature.STRICT_DUPLICATE_DETECTION)
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS);

    /**
     * Builds the rules' JSON mapper and its parser by reading a small document (about 0.1 s of CPU in a fresh
     * process), so that a batch can have it done on a background thread while it parses its arguments. Changes
     * nothing else; any failure is ignored (the real reading reports its own).
     */
    public static void prepare() {
        try {
            JSON.readTree("{\"profiles\":[{\"name\":\"p\",\"limits\":{\"a\":1.5e12,\"b\":[1,\"x\",true,null]}}]}");
        } catch (IOException | RuntimeException e) {
            // only a head start: the real reading reports its own failures
        }
    }

    /**
     * As {@link #prepare()}, then reads and checks the rules file {@code file} when it is a regular file (not a pipe,
     * which a second reading would find empty), and makes a SHA-256 digest (the run record's, whose provider is
     * loaded on first use): the first-use work of the batch's own reading of the same file, done on a background
     * thread while the command line is parsed. Returns nothing: the batch reads and hashes the file itself, and
     * {@link #parse} (and {@link IronPairRules#parse}) of that same text under the same name returns what was made
     * here instead of parsing it again; any failure is ignored (that reading reports its own).
     */
    public static void prepare(Path file) {
        prepare();
        try {
            if (file != null && java.nio.file.Files.isRegularFile(file)) {
                String text = readText(file);
                String name = file.toString();
                Rules rules = parse(text, name);
                ahead = new Ahead(text, name, rules, IronPairRules.parse(text, name));
            }
        } catch (RulesException | RuntimeException e) {
            // only a head start, as above
        }
        try {
            RunManifest.sha256(new byte[0]);
        } catch (RuntimeException e) {
            // as above
        }
    }

    /**
     * The rules read ahead by {@link #prepare(Path)}: the file's text and name and what {@link #parse} and {@link
     * IronPairRules#parse} made of them (both immutable), which those return for the same text and name instead of
     * parsing it again; null before.
     */
    private record Ahead(String text, String name, Rules rules, Optional<IronPairRules> iron) {
        boolean holds(String t, String n) {
            return name.equals(n) && text.equals(t);
        }
    }

    private static volatile Ahead ahead;

    /** The iron section {@link #prepare(Path)} read from this very text and name, or null. */
    static Optional<IronPairRules> ironAhead(String text, String name) {
        Ahead a = ahead;
        return a != null && a.holds(text, name) ? a.iron() : null;
    }

    /** Reads and checks a rules file. */
    public static Rules read(Path file) throws RulesException {
        return parse(readText(file), file.toString());
    }

    /**
     * The text of a rules file (a regular file within the JSON size limit, UTF-8), read once: a caller that also
     * needs the iron section ({@link IronPairRules#parse}) or the text's hash parses this same text.
     */
    public static String readText(Path file) throws RulesException {
        String name = file.toString();
        try {
            return trapmap.maps.io.InputFiles.readUtf8(file, trapmap.maps.io.InputFiles.JSON_MAX_BYTES);
        } catch (java.nio.file.NoSuchFileException e) {
            throw new RulesException(name + ": no such rules file");
        } catch (trapmap.maps.io.InputFiles.Refused e) {
            throw new RulesException(name + ": rules file " + e.reason());
        } catch (java.nio.charset.CharacterCodingException e) {
            throw new RulesException(name + ": rules file is not UTF-8 text");
        } catch (IOException e) {
            throw new RulesException(name + ": cannot read the rules file (" + e + ")");
        }
    }

    /** Parses and checks rules given as JSON text; {@code name} prefixes every message. */
    public static Rules parse(String text, String name) throws RulesException {
        Ahead a = ahead;
        if (a != null && a.holds(text, name)) {
            return a.rules();
        }
        JsonNode root;
        try {
            root = JSON.readTree(text);
        } catch (JsonProcessingException e) {
            throw new RulesException(name + ": " + trapmap.maps.io.JsonErrors.notJson(e));
        }
        Rules rules = new Reader(name).rules(root);
        IronPairRules.parse(text, name); // the iron section is checked with the rest, and read by the batch
        LotPattern.parse(text, name); // so is the lot pattern, read by the results store
        return rules;
    }

    /** Walks the JSON tree; each check names the field path and its unit. */
    private static final class Reader {
        private final String name;
        /** The rules' {@code physics.uncertainty} block: what flags with a confidence are drawn with. */
        private UncertaintySettings uncertainty = UncertaintySettings.DEFAULTS;

        Reader(String name) {
            this.name = name;
        }

        RulesException error(String field, String problem, String unit) {
            return RulesException.field(name, field, problem, unit);
        }

        void onlyKeys(JsonNode node, String path, Set<String> allowed) throws RulesException {
            for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) {
                String k = it.next();
                String tooLong = TextLimits.problem(k, TextLimits.MAX_ID_CHARS);
                if (tooLong != null) {
                    throw error(path.isEmpty() ? "(top level)" : path, "a key " + tooLong, "");
                }
                if (!allowed.contains(k)) {
                    throw error(path.isEmpty() ? k : path + "." + k, "unknown key; expected one of "
                            + String.join(", ", allowed), "");
                }
            }
        }

        JsonNode object(JsonNode node, String path) throws RulesException {
            if (node == null || !node.isObject()) {
                throw error(path, "must be an object", "");
            }
            return node;
        }

        double number(JsonNode node, String path, String unit, double lo, double hi) throws RulesException {
            if (!node.isNumber()) {
                throw error(path, "must be a number but is " + describe(node), unit);
            }
            double v = node.doubleValue();
            if (!(v >= lo && v <= hi)) {
                throw error(path, "must be in [" + fmt(lo) + ", " + fmt(hi) + "] but was " + fmt(v), unit);
            }
            return v;
        }

        Double optionalNumber(JsonNode parent, String key, String path, String unit, double lo, double hi)
                throws RulesException {
            JsonNode n = parent.get(key);
            return n == null || n.isNull() ? null : number(n, path + "." + key, unit, lo, hi);
        }

        String text(JsonNode node, String path) throws RulesException {
            return text(node, path, path.endsWith(".file") ? TextLimits.MAX_GLOB_CHARS : TextLimits.MAX_TEXT_CHARS);
        }

        /** A non-empty text of at most {@code maxChars} characters. */
        String text(JsonNode node, String path, int maxChars) throws RulesException {
            if (!node.isTextual() || node.asText().isBlank()) {
                throw error(path, "must be a non-empty text but is " + describe(node), "");
            }
            String t = node.asText().trim();
            String tooLong = TextLimits.problem(t, maxChars);
            if (tooLong != null) {
                throw error(path, tooLong, "");
            }
            return t;
        }

        Rules rules(JsonNode root) throws RulesException {
            if (!root.isObject()) {
                throw new RulesException(name + ": the rules must be a JSON object");
            }
            onlyKeys(root, "", new LinkedHashSet<>(List.of("conditions", "defect", "edge_exclusion_mm", "wafer",
                    "edge_band_mm", "flag", "limits", "grades", "fail_grade", "profiles", "iron", "physics", LotPattern.KEY,
                    TREND_KEY)));
            PhysicsSettings physics = PhysicsSettings.DEFAULTS;
            if (root.has("physics")) {
                try {
                    physics = PhysicsSettingsFile.parse(root.get("physics"), name, "physics");
                    uncertainty = PhysicsSettingsFile.uncertainty(root.get("physics"), name, "physics");
                } catch (InvalidValueException e) {
                    throw new RulesException(e.getMessage());
                }
            }
            MeasurementConditions c = MeasurementConditions.UNKNOWN;
            boolean override = false;
            if (root.has("conditions")) {
                JsonNode n = object(root.get("conditions"), "conditions");
                onlyKeys(n, "conditions", new LinkedHashSet<>(List.of("doping", "injection_cm3", "generation_cm3_s",
                        "temperature_k", "thickness_um", "srv_cm_s", "override")));
                Doping doping = null;
                if (n.has("doping")) {
                    String t = text(n.get("doping"), "conditions.doping");
                    try {
                        doping = MapFiles.parseDoping(t);
                    } catch (IllegalArgumentException e) {
                        throw error("conditions.doping", e.getMessage(), ""); // the message names its unit
                    }
                }
                Double injection = optionalNumber(n, "injection_cm3", "conditions", "cm^-3", 1e6, 1e19);
                Double generation = optionalNumber(n, "generation_cm3_s", "conditions", "cm^-3 s^-1", 1e10, 1e24);
                if (injection != null && generation != null) {
                    throw error("conditions.generation_cm3_s", "excludes conditions.injection_cm3; give one",
                            "cm^-3 s^-1");
                }
                Double temperature = optionalNumber(n, "temperature_k", "conditions", "K", 77, 500);
                Double thickness = optionalNumber(n, "thickness_um", "conditions", "um", 1, 5000);
                Double srv = optionalNumber(n, "srv_cm_s", "conditions", "cm/s", 0, 1e7);
                if (n.has("override")) {
                    if (!n.get("override").isBoolean()) {
                        throw error("conditions.override", "must be true or false but is " + describe(n.get(
                                "override")), "");
                    }
                    override = n.get("override").booleanValue();
                }
                c = new MeasurementConditions(doping, thickness, temperature, injection, generation, srv, null, null,
                        Map.of());
            }
            String defect = root.has("defect") ? defect(root.get("defect"), "defect") : null;
            double edgeExclusion = root.has("edge_exclusion_mm")
                    ? number(root.get("edge_exclusion_mm"), "edge_exclusion_mm", "mm", 0, 50) : 0;
            double edgeBand = root.has("edge_band_mm")
                    ? number(root.get("edge_band_mm"), "edge_band_mm", "mm", 0.1, 200) : DEFAULT_EDGE_BAND_MM;
            WaferFormat format = null;
            if (root.has("wafer")) {
                String w = text(root.get("wafer"), "wafer");
                if (!w.equals("auto")) {
                    try {
                        format = WaferFormat.byId(w);
                    } catch (IllegalArgumentException e) {
                        throw error("wafer", "'" + w + "' is neither auto nor a known format ("
                                + String.join(", ", WaferFormat.ids()) + ")", "");
                    }
                }
            }
            if (!root.has("flag")) {
                throw error("flag", "is required: {\"quantity\": \"lifetime\", \"threshold\": <us>,"
                        + " \"min_area_mm2\": <mm²>}", "");
            }
            Flag flag = flag(object(root.get("flag"), "flag"), "flag");
            List<Limit> limits = root.has("limits") ? limits(root.get("limits"), "limits") : List.of();
            List<Grade> grades = root.has("grades") ? grades(root.get("grades"), "grades") : List.of();
            String failGrade = root.has("fail_grade") ? failGrade(root.get("fail_grade"), "fail_grade", grades)
                    : "";
            Profile top = new Profile(DEFAULT_PROFILE, null, defect, flag, limits, grades, failGrade);
            if (defect == null && top.needsTrapDensity()) {
                throw error("defect", "is required for trap-density flags and figures (a defect id such as fe-i)",
                        "");
            }
            exceedanceNeedsDensityFlag(top, "");
            if (top.usesStackFigures()) {
                throw error("limits", Figure.BEST_DEFECT_AREA_FRACTION + " and " + Figure.NO_SINGLE_DEFECT_AREA_FRACTION
                        + " need an injection stack: give them in a profile with a \"stack\"", "");
            }
            List<Profile> profiles = root.has("profiles") ? profiles(root.get("profiles"), top) : List.of();
            Rules rules = new Rules(c, override, defect, edgeExclusion, format, edgeBand, flag, limits, grades,
                    failGrade, profiles, physics);
            if (!root.has(TREND_KEY) || root.get(TREND_KEY).isNull()) {
                return rules;
            }
            TrendSettings trend = trend(object(root.get(TREND_KEY), TREND_KEY), rules.figures());
            return new Rules(c, override, defect, edgeExclusion, format, edgeBand, flag, limits, grades, failGrade,
                    profiles, physics, Optional.of(trend));
        }

        /**
         * The {@code trend} block: {@code figure} (required, one the rules report), {@code by} (default
         * {@value TrendSettings#DEFAULT_BY}), {@code baseline} (a count of charted wafers) or {@code baseline_until}
         * (a UTC date or ISO-8601 time), {@code alarm_rules} (names of {@link RunRule}s in lower case; default
         * {@code ["beyond_3_sigma"]}).
         */
        TrendSettings trend(JsonNode n, List<Figure> reported) throws RulesException {
            String p = TREND_KEY;
            onlyKeys(n, p, new LinkedHashSet<>(List.of("figure", "by", "baseline", "baseline_until",
                    "alarm_rules")));
            if (!n.has("figure")) {
                throw error(p + ".figure", "is required: the figure charted, e.g. trap_density_p50_cm3", "");
            }
            String figure = text(n.get("figure"), p + ".figure", TextLimits.MAX_ID_CHARS);
            try {
                Figure.parse(figure);
            } catch (IllegalArgumentException e) {
                throw error(p + ".figure", e.getMessage(), "");
            }
            if (reported.stream().noneMatch(f -> f.name().equals(figure))) {
                throw error(p + ".figure", "'" + figure + "' is not reported by these rules (they report "
                        + String.join(", ", reported.stream().map(Figure::name).toList())
                        + "); name it in a limit or grade to have it stored", "");
            }
            TrendSettings defaults = TrendSettings.defaults(figure);
            String by = n.has("by") ? text(n.get("by"), p + ".by", TextLimits.MAX_ID_CHARS) : defaults.by();
            if (n.has("baseline") && n.has("baseline_until")) {
                throw error(p + ".baseline_until", "excludes " + p + ".baseline; give one", "");
            }
            Baseline baseline = defaults.baseline();
            if (n.has("baseline")) {
                JsonNode b = n.get("baseline");
                double count = number(b, p + ".baseline", "charted wafers", 2, 1_000_000);
                if (count != Math.rint(count)) {
                    throw error(p + ".baseline", "must be a whole number but was " + b.asText(), "charted wafers");
                }
                baseline = Baseline.first((int) count);
            } else if (n.has("baseline_until")) {
                String t = text(n.get("baseline_until"), p + ".baseline_until");
                try {
                    baseline = Baseline.before(t.length() == 10
                            ? LocalDate.parse(t).atStartOfDay(ZoneOffset.UTC).toInstant() : Instant.parse(t));
                } catch (DateTimeParseException e) {
                    throw error(p + ".baseline_until", "must be a UTC date (2026-10-12) or time"
                            + " (2026-10-12T08:00:00Z) but was '" + t + "'", "");
                }
            }
            Set<RunRule> alarm = defaults.alarmRules();
            if (n.has("alarm_rules")) {
                JsonNode a = n.get("alarm_rules");
                if (!a.isArray()) {
                    throw error(p + ".alarm_rules", "must be an array of run rules (" + runRuleKeys() + ") but is "
                            + describe(a), "");
                }
                Set<RunRule> given = EnumSet.noneOf(RunRule.class);
                for (int i = 0; i < a.size(); i++) {
                    String q = p + ".alarm_rules[" + i + "]";
                    String k = text(a.get(i), q, TextLimits.MAX_ID_CHARS);
                    RunRule rule = Arrays.stream(RunRule.values()).filter(r -> TrendSettings.key(r).equals(k))
                            .findFirst().orElseThrow(() -> error(q, "'" + k + "' is not a run rule; expected one of "
                                    + runRuleKeys(), ""));
                    if (!given.add(rule)) {
                        throw error(q, "'" + k + "' is given twice", "");
                    }
                }
                alarm = given;
            }
            return new TrendSettings(figure, by, baseline, alarm);
        }

        private static String runRuleKeys() {
            return String.join(", ", Arrays.stream(RunRule.values()).map(TrendSettings::key).toList());
        }

        /** An exceedance figure is measured against the profile's trap-density flag threshold. */
        void exceedanceNeedsDensityFlag(Profile p, String prefix) throws RulesException {
            for (Figure f : p.figures()) {
                if (f.kind() == Figure.Kind.EXCEEDANCE_AREA_FRACTION && p.flag().quantity() != FlagQuantity.TRAP_DENSITY) {
                    throw error(prefix + "flag.quantity", f.name() + " is the share of the area whose trap density"
                            + " exceeds the flag threshold with that confidence: it needs a trap-density flag", "");
                }
            }
        }

        String defect(JsonNode node, String path) throws RulesException {
            String id = text(node, path);
            try {
                return DefectLibrary.byId(id).id();
            } catch (IllegalArgumentException e) {
                throw error(path, e.getMessage(), "");
            }
        }

        String failGrade(JsonNode node, String path, List<Grade> grades) throws RulesException {
            String g = text(node, path);
            if (grades.stream().anyMatch(x -> x.grade().equals(g))) {
                throw error(path, "'" + g + "' is also a grade of passing wafers; a failed wafer needs its own grade",
                        "");
            }
            return g;
        }

        List<Profile> profiles(JsonNode node, Profile top) throws RulesException {
            if (!node.isArray()) {
                throw error("profiles", "must be an array of {\"name\": text, \"match\": {...}, ...}", "");
            }
            List<Profile> out = new ArrayList<>();
            Set<String> names = new LinkedHashSet<>(List.of(DEFAULT_PROFILE));
            for (int i = 0; i < node.size(); i++) {
                String p = "profiles[" + i + "]";
                JsonNode n = object(node.get(i), p);
                onlyKeys(n, p, new LinkedHashSet<>(List.of("name", "match", "defect", "flag", "limits", "grades",
                        "fail_grade", "stack")));
                if (!n.has("name")) {
                    throw error(p + ".name", "is required", "");
                }
                String name = text(n.get("name"), p + ".name", TextLimits.MAX_ID_CHARS);
                if (!names.add(name)) {
                    throw error(p + ".name", "'" + name + "' is given twice (" + DEFAULT_PROFILE
                            + " is the top level)", "");
                }
                if (!n.has("match")) {
                    throw error(p + ".match", "is required: {\"type\": \"p\"|\"n\", \"wafer\": [format ids],"
                            + " \"file\": glob}", "");
                }
                Match match = match(object(n.get("match"), p + ".match"), p + ".match");
                String defect = n.has("defect") ? defect(n.get("defect"), p + ".defect") : top.defectId();
                Flag flag = n.has("flag") ? flag(object(n.get("flag"), p + ".flag"), p + ".flag") : top.flag();
                List<Limit> limits = n.has("limits") ? limits(n.get("limits"), p + ".limits") : top.limits();
                List<Grade> grades = n.has("grades") ? grades(n.get("grades"), p + ".grades") : top.grades();
                String failGrade = n.has("fail_grade") ? failGrade(n.get("fail_grade"), p + ".fail_grade", grades)
                        : top.failGrade();
                if (!n.has("fail_grade") && grades.stream().anyMatch(g -> g.grade().equals(failGrade))) {
                    throw error(p + ".fail_grade", "the inherited '" + failGrade + "' is also a grade of passing"
                            + " wafers here", "");
                }
                StackRules stack = null;
                if (n.has("stack")) {
                    if (defect == null) {
                        throw error(p + ".defect", "is required with a stack: the defect whose share of the area"
                                + " best_defect_area_fraction gives (a defect id such as fe-i)", "");
                    }
                    stack = StackRules.parse(n.get("stack"), p + ".stack", this.name, defect);
                }
                Profile profile = new Profile(name, match, defect, flag, limits, grades, failGrade, stack);
                if (defect == null && profile.needsTrapDensity()) {
                    throw error(p + ".defect", "is required for trap-density flags and figures (a defect id such"
                            + " as midgap)", "");
                }
                exceedanceNeedsDensityFlag(profile, p + ".");
                if (stack == null && profile.usesStackFigures()) {
                    throw error(p + ".stack", "is required for " + Figure.BEST_DEFECT_AREA_FRACTION + " and "
                            + Figure.NO_SINGLE_DEFECT_AREA_FRACTION + ": {\"levels\": [glob, glob, …]}", "");
                }
                if (stack != null && match.file() == null) {
                    throw error(p + ".match.file", "is required with a stack: a glob that picks the first level's"
                            + " maps (e.g. the stack's levels[0])", "");
                }
                out.add(profile);
            }
            return out;
        }

        Match match(JsonNode n, String p) throws RulesException {
            onlyKeys(n, p, new LinkedHashSet<>(List.of("type", "wafer", "file")));
            if (n.isEmpty()) {
                throw error(p, "needs type, wafer, file or several", "");
            }
            ConductivityType type = null;
            if (n.has("type")) {
                String t = text(n.get("type"), p + ".type");
                type = switch (t) {
                    case "p" -> ConductivityType.P;
                    case "n" -> ConductivityType.N;
                    default -> throw error(p + ".type", "must be p or n but was '" + t + "'", "");
                };
            }
            List<String> families = new ArrayList<>();
            if (n.has("wafer")) {
                JsonNode w = n.get("wafer");
                List<JsonNode> items = new ArrayList<>();
                if (w.isArray()) {
                    w.forEach(items::add);
                } else {
                    items.add(w);
                }
                if (items.isEmpty()) {
                    throw error(p + ".wafer", "must name at least one format", "");
                }
                for (JsonNode item : items) {
                    String id = text(item, p + ".wafer");
                    if (!id.equals("fitted") && !id.equals("unfitted") && !WaferFormat.familyIds().contains(id)) {
                        throw error(p + ".wafer", "'" + id + "' is not a known format (" + String.join(", ",
                                WaferFormat.familyIds()) + ", fitted, unfitted)", "");
                    }
                    families.add(id);
                }
            }
            String file = null;
            if (n.has("file")) {
                file = text(n.get("file"), p + ".file");
                try {
                    FileGlob.compile(file);
                } catch (IllegalArgumentException e) {
                    throw error(p + ".file", "not a valid glob: " + e.getMessage(), "");
                }
            }
            return new Match(type, families, file);
        }

        Flag flag(JsonNode n, String path) throws RulesException {
            onlyKeys(n, path, new LinkedHashSet<>(List.of("quantity", "threshold", "min_area_mm2", "below_limit",
                    "confidence")));
            if (!n.has("quantity")) {
                throw error(path + ".quantity", "is required: lifetime or trap-density", "");
            }
            String q = text(n.get("quantity"), path + ".quantity");
            FlagQuantity quantity = switch (q) {
                case "lifetime" -> FlagQuantity.LIFETIME;
                case "trap-density" -> FlagQuantity.TRAP_DENSITY;
                default -> throw error(path + ".quantity", "must be lifetime or trap-density but was '" + q + "'",
                        "");
            };
            if (!n.has("threshold")) {
                throw error(path + ".threshold", "is required", quantity.unit());
            }
            double t = quantity == FlagQuantity.LIFETIME
                    ? number(n.get("threshold"), path + ".threshold", "us", 1e-6, 1e6)
                    : number(n.get("threshold"), path + ".threshold", "cm^-3", 1, 1e20);
            double minArea = n.has("min_area_mm2")
                    ? number(n.get("min_area_mm2"), path + ".min_area_mm2", "mm²", 0, 1e6) : 0;
            BelowLimit below = BelowLimit.EXCLUDE;
            if (n.has("below_limit")) {
                String b = text(n.get("below_limit"), path + ".below_limit");
                below = switch (b) {
                    case "exclude" -> BelowLimit.EXCLUDE;
                    case "at_bound" -> BelowLimit.AT_BOUND;
                    default -> throw error(path + ".below_limit", "must be exclude or at_bound but was '" + b + "'",
                            "");
                };
            }
            double confidence = 0;
            if (n.has("confidence")) {
                if (quantity != FlagQuantity.TRAP_DENSITY) {
                    throw error(path + ".confidence", "needs a trap-density flag (the probability that the trap"
                            + " density exceeds the threshold); a lifetime flag has no confidence", "");
                }
                confidence = number(n.get("confidence"), path + ".confidence", "probability, 0.95 = 95 %", 1e-6, 1);
            }
            return new Flag(quantity, t, minArea, below, confidence, uncertainty);
        }

        List<Limit> limits(JsonNode node, String path) throws RulesException {
            object(node, path);
            List<Limit> out = new ArrayList<>();
            for (Iterator<Map.Entry<String, JsonNode>> it = node.fields(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> e = it.next();
                String p = path + "." + e.getKey();
                Figure f;
                try {
                    f = Figure.parse(e.getKey());
                } catch (IllegalArgumentException ex) {
                    throw error(p, ex.getMessage(), "");
                }
                JsonNode l = object(e.getValue(), p);
                onlyKeys(l, p, new LinkedHashSet<>(List.of("min", "max")));
                Double min = optionalNumber(l, "min", p, f.unit(), -Double.MAX_VALUE, Double.MAX_VALUE);
                Double max = optionalNumber(l, "max", p, f.unit(), -Double.MAX_VALUE, Double.MAX_VALUE);
                if (min == null && max == null) {
                    throw error(p, "needs min, max or both", f.unit());
                }
                if (min != null && max != null && min > max) {
                    throw error(p + ".min", "must be <= max (" + fmt(max) + ") but was " + fmt(min), f.unit());
                }
                out.add(new Limit(f, min == null ? Double.NaN : min, max == null ? Double.NaN : max));
            }
            return out;
        }

        List<Grade> grades(JsonNode node, String path) throws RulesException {
            if (!node.isArray()) {
                throw error(path, "must be an array of {\"grade\": text, \"when\": {limits}}", "");
            }
            List<Grade> out = new ArrayList<>();
            Set<String> seen = new LinkedHashSet<>();
            for (int i = 0; i < node.size(); i++) {
                String p = path + "[" + i + "]";
                JsonNode g = object(node.get(i), p);
                onlyKeys(g, p, new LinkedHashSet<>(List.of("grade", "when")));
                if (!g.has("grade")) {
                    throw error(p + ".grade", "is required", "");
                }
                String grade = text(g.get("grade"), p + ".grade", TextLimits.MAX_ID_CHARS);
                if (!seen.add(grade)) {
                    throw error(p + ".grade", "'" + grade + "' is given twice", "");
                }
                out.add(new Grade(grade, g.has("when") ? limits(g.get("when"), p + ".when") : List.of()));
            }
            return out;
        }

        private static String describe(JsonNode n) {
            if (n.isTextual()) {
                return "a text (\"" + n.asText() + "\")";
            }
            if (n.isArray()) {
                return "an array";
            }
            if (n.isObject()) {
                return "an object";
            }
            return n.isNumber() ? "a number (" + n.asText() + ")" : n.toString();
        }

        private static String fmt(double v) {
            return trapmap.shared.check.Checks.exact(v);
        }
    }
}
