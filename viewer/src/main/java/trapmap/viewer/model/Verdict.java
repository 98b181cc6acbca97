package trapmap.viewer.model;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import trapmap.maps.batch.Figure;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferInspection;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.stats.InvalidArea;

/**
 * How one wafer was judged, as every face of the viewer states it (gallery, threshold panel, status bar, wafer
 * report): either the verdict of a rules file, computed by the batch's own {@link WaferInspection}, or the viewer's
 * quick threshold check, which is not a rules verdict and says so.
 *
 * @param rulesVerdict     true: judged by a rules file; false: the quick threshold check
 * @param pass             the outcome
 * @param grade            the rules' grade ("" when none, always "" for the quick check)
 * @param rulesName        the rules file's name ("" for the quick check)
 * @param profile          the rules profile that judged the wafer ("" for the quick check)
 * @param defectId         the defect of the trap densities judged, or null when none was used
 * @param defectOverridden true when that defect replaced the profile's own (a user override)
 * @param failedRules      figures outside their limits
 * @param gradedDownBy     for a passing wafer, the figures that kept it from a better grade
 * @param figures          the judged figures by name (the batch's {@code results.csv} columns), in their units
 * @param rule             one line stating the flag and pass rule that was applied
 * @param conditionsOverridden true when conditions typed into the viewer replaced the sidecar's before judging (the
 *                         batch would not see them)
 * @param invalid          the unusable share of the evaluated area with its causes (the figure
 *                         {@code invalid_area_fraction}, computed by the maps module), or null when unknown
 */
public record Verdict(boolean rulesVerdict, boolean pass, String grade, String rulesName, String profile,
                      String defectId, boolean defectOverridden, List<String> failedRules, List<String> gradedDownBy,
                      Map<String, Double> figures, String rule, boolean conditionsOverridden, InvalidArea invalid) {
    /** The label of the viewer's own rule, wherever it is shown. */
    public static final String QUICK_CHECK = "quick threshold check";

    public Verdict {
        grade = grade == null ? "" : grade;
        rulesName = rulesName == null ? "" : rulesName;
        profile = profile == null ? "" : profile;
        failedRules = List.copyOf(failedRules);
        gradedDownBy = List.copyOf(gradedDownBy);
        figures = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(figures));
    }

    /** The verdict of a rules evaluation by {@code rules}, read from a file named {@code rulesName}. */
    static Verdict of(WaferInspection.Evaluation e, Rules rules, String rulesName, boolean conditionsOverridden) {
        WaferResult r = e.result();
        Rules.Flag f = e.profile().flag();
        String rule = f.quantity().key() + (f.quantity() == Rules.FlagQuantity.LIFETIME ? " below " : " above ")
                + Units.withUnit(f.threshold(), f.quantity().unit())
                + (f.confident() ? " with probability at least " + Units.number(f.confidence()) : "")
                + ", regions of at least "
                + Units.number(f.minAreaMm2()) + " mm², edge exclusion " + Units.number(rules.edgeExclusionMm())
                + " mm";
        return new Verdict(true, r.status() == WaferResult.Status.PASS, r.grade(), rulesName, r.profile(),
                r.defectId(), e.defectOverridden(), r.failed(), r.gradedDownBy(), r.figures(), rule,
                conditionsOverridden, e.invalid());
    }

    /** The quick threshold check of a flagged fraction against the rule's limit (invalid area unknown). */
    static Verdict quick(double flaggedFraction, ThresholdRule t, String unit, String defectId) {
        return quick(flaggedFraction, t, unit, defectId, null, Double.NaN);
    }

    /**
     * The quick threshold check of a flagged fraction against the rule's limit. It reports the invalid area and the
     * share below the detection limit beside it, and warns (without failing: it is no rules verdict) when the invalid
     * area is above {@link InvalidArea#DEFAULT_LIMIT}.
     *
     * @param invalid            the unusable share of the evaluated area, or null when unknown
     * @param belowLimitFraction the share of the evaluated area below the detection limit, NaN when not converted
     */
    static Verdict quick(double flaggedFraction, ThresholdRule t, String unit, String defectId, InvalidArea invalid,
                         double belowLimitFraction) {
        boolean pass = !Double.isNaN(flaggedFraction) && flaggedFraction <= t.maxFlaggedFraction();
        String rule = "pixels " + t.side().name().toLowerCase(Locale.ROOT) + " " + Units.withUnit(t.value(), unit)
                + ", regions of at least " + Units.number(t.minAreaMm2()) + " mm²; pass up to "
                + Units.percent(t.maxFlaggedFraction()) + " flagged";
        Map<String, Double> figures = new LinkedHashMap<>();
        figures.put("flagged_area_fraction", flaggedFraction);
        if (invalid != null) {
            figures.put(Figure.INVALID_AREA_FRACTION, invalid.fraction());
        }
        if (!Double.isNaN(belowLimitFraction)) {
            figures.put("below_limit_area_fraction", belowLimitFraction);
        }
        return new Verdict(false, pass, "", "", "", defectId, false, pass ? List.of() : List.of(
                "flagged_area_fraction"), List.of(), figures, rule, false, invalid);
    }

    /**
     * The quick check's warning of an invalid area above the default limit, e.g. {@code invalid_area_fraction 0.34 >
     * 0.05 (default limit)}; empty for a rules verdict (whose failed rules say it) and within the limit.
     */
    public String invalidAreaWarning() {
        return rulesVerdict || invalid == null ? "" : invalid.defaultLimitWarning();
    }

    /** The same verdict, stating that its defect replaced the usual one. */
    Verdict withDefectOverridden() {
        return new Verdict(rulesVerdict, pass, grade, rulesName, profile, defectId, true, failedRules, gradedDownBy,
                figures, rule, conditionsOverridden, invalid);
    }

    /** "pass" or "fail". */
    public String outcome() {
        return pass ? "pass" : "fail";
    }

    /**
     * One line: the outcome and grade of a rules verdict ("pass · grade A"), or the quick check's outcome labelled as
     * such ("quick threshold check: fail").
     */
    public String headline() {
        if (!rulesVerdict) {
            return QUICK_CHECK + ": " + outcome();
        }
        return outcome() + (grade.isEmpty() ? "" : " · grade " + grade);
    }

    /** The headline, followed by the quick check's invalid-area warning when there is one (the status bar). */
    public String headlineWithWarning() {
        String w = invalidAreaWarning();
        return w.isEmpty() ? headline() : headline() + " — warning: " + w;
    }

    /** Where the verdict comes from: rules file and profile, with the defect and whether it was overridden. */
    public String basis() {
        if (!rulesVerdict) {
            return QUICK_CHECK + " (not a rules verdict): " + rule;
        }
        return "rules " + rulesName + ", profile " + profile + (defectId == null ? "" : ", defect " + defectId
                + (defectOverridden ? " (overridden defect, not the profile's)" : ""))
                + (conditionsOverridden ? ", with conditions typed into the viewer" : "");
    }

    /** The invalid area with its causes, and the share below the detection limit next to it when known. */
    private void areaRows(List<String[]> rows) {
        if (invalid != null) {
            rows.add(new String[] {"invalid area", invalid.describe()});
        }
        Double below = figures.get("below_limit_area_fraction");
        if (below != null) {
            rows.add(new String[] {"below detection limit", Units.number(below) + " of the evaluated area (usable,"
                    + " not invalid: the density is under the detection limit)"});
        }
    }

    /** Label–value rows for a report: verdict, grade, profile, defect, failed rules, graded down by, rule. */
    public List<String[]> rows() {
        List<String[]> rows = new ArrayList<>();
        if (!rulesVerdict) {
            rows.add(new String[] {"verdict", QUICK_CHECK + ": " + outcome() + " (not a rules verdict)"});
            rows.add(new String[] {"rule", rule});
            rows.add(new String[] {"defect", defectId == null ? "none" : defectId + (defectOverridden
                    ? " (overridden for this wafer)" : "")});
            areaRows(rows);
            if (!invalidAreaWarning().isEmpty()) {
                rows.add(new String[] {"warning", invalidAreaWarning() + ": the measurement lost much of the wafer"});
            }
            return rows;
        }
        rows.add(new String[] {"verdict", outcome()});
        rows.add(new String[] {"grade", grade.isEmpty() ? "none" : grade});
        rows.add(new String[] {"rules", rulesName + ", profile " + profile});
        rows.add(new String[] {"defect", defectId == null ? "none" : defectId + (defectOverridden
                ? " (judged with an overridden defect)" : "")});
        rows.add(new String[] {"failed rules", failedRules.isEmpty() ? "none" : String.join(", ", failedRules)});
        rows.add(new String[] {"graded down by", gradedDownBy.isEmpty() ? "none" : String.join(", ", gradedDownBy)});
        rows.add(new String[] {"flag", rule});
        areaRows(rows);
        if (conditionsOverridden) {
            rows.add(new String[] {"conditions", "typed into the viewer, replacing the sidecar's (not what the batch"
                    + " sees)"});
        }
        return rows;
    }
}
