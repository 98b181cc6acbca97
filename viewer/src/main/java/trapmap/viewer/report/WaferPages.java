package trapmap.viewer.report;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import trapmap.maps.batch.Figure;
import trapmap.maps.batch.RulesException;
import trapmap.maps.raster.PitchPrecision;
import trapmap.physics.defect.Defect;
import trapmap.shared.error.InvalidValueException;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.model.DisplayedQuantity;
import trapmap.viewer.model.ExceedanceLayer;
import trapmap.viewer.model.ExceedanceSettings;
import trapmap.viewer.model.Units;
import trapmap.viewer.model.Verdict;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.model.WaferAnalysis;

/**
 * The wafer report page of one wafer's viewer results, the same for the window (Ctrl+P) and for
 * {@code trapmap report}: the map as shown, its statistics mask, flags and outline, the conditions, the defect, the
 * notes and the verdict (a rules verdict with grade, profile, defect, failed rules and graded-down-by, or the quick
 * threshold check stated as not being one). No display needed.
 */
public final class WaferPages {
    private WaferPages() {
    }

    /**
     * What {@link #write} judged.
     *
     * @param pass         the outcome
     * @param headline     outcome and grade in one line, e.g. "pass · grade A"
     * @param basis        rules file, profile and defect (and whether it was overridden)
     * @param failedRules  figures outside their limits
     * @param gradedDownBy figures that kept a passing wafer from a better grade
     * @param written      whether the page was written (false: the {@link Drawing} skipped it)
     */
    public record Written(boolean pass, String headline, String basis, List<String> failedRules,
                          List<String> gradedDownBy, boolean written) {
    }

    /** Runs the step that draws and writes the page, or skips it; says whether it ran to its end. */
    @FunctionalInterface
    public interface Drawing {
        boolean draw(Page page) throws IOException;

        /** Always draws. */
        Drawing ALWAYS = page -> {
            page.write();
            return true;
        };
    }

    /** Drawing and writing the page. */
    @FunctionalInterface
    public interface Page {
        void write() throws IOException;
    }

    /**
     * Judges one map by a rules file with the viewer's headless model (the batch's engine underneath) and writes its
     * report page, atomically; no display needed.
     *
     * @param map            the map file
     * @param rulesFile      the rules file
     * @param quantityKey    the quantity shown on the page ({@link DisplayedQuantity#key()})
     * @param defectOverride a defect id replacing the rules profile's, or null
     * @param pdf            the report to write
     * @throws RulesException        when the rules file is not valid (naming the file and the field)
     * @throws InvalidValueException with field {@code quantity}, {@code defect} or {@code map} for a value that
     *                               cannot be used (an unknown quantity or defect, a map that cannot be read or judged)
     */
    public static Written write(Path map, Path rulesFile, String quantityKey, String defectOverride, Path pdf)
            throws java.io.IOException, trapmap.maps.batch.RulesException {
        return write(map, rulesFile, quantityKey, defectOverride, pdf, null);
    }

    /**
     * As {@link #write(Path, Path, String, String, Path)}, converting with {@code physics} (null: the rules
     * file's physics block), which replaces the rules file's block.
     */
    public static Written write(Path map, Path rulesFile, String quantityKey, String defectOverride, Path pdf,
                                trapmap.physics.conversion.PhysicsSettings physics)
            throws IOException, RulesException {
        return write(map, rulesFile, quantityKey, defectOverride, pdf, physics, Drawing.ALWAYS);
    }

    /**
     * As {@link #write(Path, Path, String, String, Path, trapmap.physics.conversion.PhysicsSettings)}, the page drawn
     * through {@code drawing}, which may skip it (a runtime that cannot draw text): the judgement is made and returned
     * either way.
     */
    public static Written write(Path map, Path rulesFile, String quantityKey, String defectOverride, Path pdf,
                                trapmap.physics.conversion.PhysicsSettings physics, Drawing drawing)
            throws IOException, RulesException {
        DisplayedQuantity q;
        try {
            q = DisplayedQuantity.ofKey(quantityKey);
        } catch (IllegalArgumentException e) {
            throw new InvalidValueException("quantity", "", e.getMessage());
        }
        ViewerModel model = new ViewerModel();
        model.loadRules(rulesFile);
        if (physics != null) {
            model.setPhysics(physics);
        }
        ViewerModel.OpenOutcome opened = model.open(List.of(map));
        if (model.size() != 1) {
            throw new InvalidValueException("map", "", opened.errors().isEmpty() ? map + ": not a map"
                    : opened.errors().get(0));
        }
        if (defectOverride != null) {
            try {
                model.setDefectOverride(0, defectOverride);
            } catch (IllegalArgumentException e) {
                throw new InvalidValueException("defect", "", e.getMessage());
            }
        }
        model.setAnalysis(model.analysis().withQuantity(q), "quantity");
        WaferAnalysis r = model.compute(0, () -> false);
        if (r == null) {
            throw new InvalidValueException("map", "", model.wafer(0).error());
        }
        boolean written = drawing.draw(() -> WaferReport.write(of(model.wafer(0).path(), r, null, model.defectOf(r)),
                pdf));
        Verdict v = r.verdict();
        return new Written(v.pass(), v.headline(), v.basis(), v.failedRules(), v.gradedDownBy(), written);
    }

    /**
     * The page.
     *
     * @param file   the map's file
     * @param r      the wafer's results
     * @param style  colours and range as shown, or null for the report's default
     * @param defect the defect of {@code r}'s conversion, or null when none was converted
     */
    public static WaferReport.Content of(Path file, WaferAnalysis r, DisplayStyle style, Defect defect) {
        List<String> notes = new ArrayList<>();
        if (r.analysis().quantity().isProbability() && r.exceedanceSettings() != null) {
            // the map's own label says N*; its value is here
            ExceedanceSettings x = r.exceedanceSettings();
            notes.add(String.format(Locale.ROOT, "map: %s, over the uncertainties of the conditions and the defect"
                    + " (%d samples, seed %d)", ExceedanceLayer.legend(x), x.samples(), x.seed()));
        }
        notes.add(String.format(Locale.ROOT, "flagged regions cover %s of the evaluated area (%d region%s)",
                Units.percent(r.flaggedFraction()), r.regions().size(), r.regions().size() == 1 ? "" : "s"));
        notes.add(String.format(Locale.ROOT, "harmonic-mean lifetime %.1f %s, median %.1f %s over the evaluated area,"
                + " %s %s (%d pixels × %s %s; edge exclusion %s mm)", r.lifetimeStats().harmonicMean(), Typeset.US,
                r.lifetimeStats().median(), Typeset.US, PitchPrecision.areaOfPixels(r.lifetimeStats().areaMm2(),
                r.lifetimeStats().count()), Typeset.MM2, r.lifetimeStats().count(),
                Units.number(r.displayed().grid().pixelAreaMm2()), Typeset.MM2, Units.number(r.edgeExclusionMm())));
        if (r.conversion() != null) {
            notes.add("physics settings: " + r.conversion().physics().oneLine());
        }
        r.warnings().forEach(x -> notes.add("caution: " + x.message()));
        return WaferReport.Content.of(r.displayed(), file.toString()).withStyle(style)
                .withStatisticsMask(r.mask()).withFlags(r.flagThreshold(), r.flagged(), r.regions(), r.flagUnit())
                .withOutline(r.shape(), r.edgeExclusionMm()).withConditions(r.lifetime().conditions())
                .withDefect(r.analysis().quantity() == DisplayedQuantity.LIFETIME && !r.verdict().rulesVerdict()
                        ? null : defect)
                .withNotes(notes).withJudgement(judgement(r.verdict()));
    }

    /** The verdict as the report states it. */
    public static WaferReport.Judgement judgement(Verdict v) {
        String headline = v.rulesVerdict()
                ? "Verdict: " + v.outcome().toUpperCase(Locale.ROOT) + (v.grade().isEmpty() ? "" : " - grade "
                + v.grade()) + " (profile " + v.profile() + (v.defectId() == null ? "" : ", defect " + v.defectId()
                + (v.defectOverridden() ? " overridden" : "")) + ")"
                : "Quick threshold check: " + v.outcome().toUpperCase(Locale.ROOT) + " (not a rules verdict)";
        List<String[]> rows = new ArrayList<>();
        for (String[] r : v.rows()) {
            boolean figures = r.length == 2 && (r[0].equals("failed rules") || r[0].equals("graded down by"));
            rows.add(figures ? new String[] {r[0], readable(r[1])} : r);
        }
        return new WaferReport.Judgement(v.pass(), headline, rows);
    }

    /** A list of failed rules ("a_b_mm2, c_d") with each figure by its readable name ("largest region, …"). */
    static String readable(String rules) {
        List<String> out = new ArrayList<>();
        for (String rule : rules.split(", ")) {
            out.add(Figure.readable(rule));
        }
        return String.join(", ", out);
    }
}
