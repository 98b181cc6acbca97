package trapmap.viewer.ui;

import java.io.IOException;
import java.io.StringWriter;
import java.nio.file.Path;
import trapmap.maps.io.AtomicFiles;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import trapmap.maps.batch.Figure;
import trapmap.maps.io.CsvCells;
import trapmap.maps.io.NumberText;
import org.apache.commons.csv.CSVPrinter;
import trapmap.maps.io.MapFiles;
import trapmap.maps.region.Region;
import trapmap.maps.stats.MapStatistics;
import trapmap.physics.defect.Defect;
import trapmap.viewer.report.WaferPages;
import trapmap.viewer.report.WaferReport;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.model.Analysis;
import trapmap.viewer.model.DisplayedQuantity;
import trapmap.viewer.model.Verdict;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.model.WaferAnalysis;

/** What the window exports, built from model results without a display: region tables, report pages, files. */
public final class ViewerExports {
    private ViewerExports() {
    }

    /** Writes bytes atomically: a temporary file beside the target, then a rename. */
    /**
     * The caption of an exported view: the wafer (its id, else its file name), the quantity shown with its unit, the
     * defect it was converted with (none for the measured lifetime) and the export date.
     */
    public static trapmap.maps.io.Caption viewCaption(ViewerModel.OpenWafer w, DisplayedQuantity shown,
                                                      String defectId, java.time.LocalDate date) {
        String id = w.map().waferId();
        return new trapmap.maps.io.Caption(id == null || id.isBlank() ? w.name() : id, shown.quantity().key(),
                shown.unit(), shown.needsDefect() ? defectId : null, date == null ? null : date.toString());
    }

    /** The PNG bytes of an exported view ({@code view}: map and colour bar) with its caption strip below. */
    public static byte[] viewPng(java.awt.image.BufferedImage view, trapmap.maps.io.Caption caption) {
        return trapmap.maps.io.PngFiles.encode(trapmap.maps.io.CaptionedPicture.withCaption(view, caption));
    }

    public static void writeAtomically(Path target, byte[] bytes) throws IOException {
        AtomicFiles.write(target, bytes);
    }

    /** The flagged regions of a result as CSV text (units in the column names). */
    public static String regionsCsv(WaferAnalysis r) throws IOException {
        String unit = r.analysis().quantity().quantity().unit().replace("µs", "us");
        String suffix = unit.isEmpty() ? "" : "_" + unit.replace("^-3", "-3").replace(" ", "");
        StringWriter sw = new StringWriter();
        try (CSVPrinter csv = new CSVPrinter(sw, CSVFormat.DEFAULT.builder().setRecordSeparator("\n").get())) {
            csv.printRecord("id", "area_mm2", "centroid_x_mm", "centroid_y_mm", "peak" + suffix, "peak_x_mm",
                    "peak_y_mm", "mean" + suffix, "edge_distance_mm");
            for (Region g : r.regions().regions()) {
                csv.printRecord(g.id(), NumberText.mm2(g.areaMm2()), NumberText.mm(g.centroidXMm()),
                        NumberText.mm(g.centroidYMm()), NumberText.sample(g.peakValue()), NumberText.mm(g.peakXMm()),
                        NumberText.mm(g.peakYMm()), NumberText.of(g.meanValue()), NumberText.mm(g.edgeDistanceMm()));
            }
        }
        return sw.toString();
    }

    /**
     * Writes the shown (converted) map with its metadata and history through the maps module's writers, atomically:
     * a {@code .tif}/{@code .tiff} file reads back identically, a {@code .csv} file holds {@code x_mm,y_mm,value}.
     *
     * @throws trapmap.maps.io.MapFormatException for another extension
     */
    public static void writeMap(WaferAnalysis r, Path file) throws IOException {
        MapFiles.write(r.displayed(), file);
    }

    /**
     * The statistics table of a result as CSV ({@code statistic,value,unit}): the shown quantity over the evaluated
     * pixels (count, area, mean, harmonic and geometric mean, median, standard deviation, extremes, percentiles),
     * the lifetime's harmonic mean and median, the flagged fraction and regions, then how the wafer was judged
     * (judged by, verdict, grade, profile, defect, failed rules, graded down by) and the judged figures by name.
     */
    public static String statisticsCsv(WaferAnalysis r) throws IOException {
        String unit = csvUnit(r.displayed().quantity().unit());
        MapStatistics s = r.displayedStats();
        StringWriter sw = new StringWriter();
        try (CSVPrinter csv = new CSVPrinter(sw, CSVFormat.DEFAULT.builder().setRecordSeparator("\n").get())) {
            csv.printRecord("statistic", "value", "unit");
            csv.printRecord("quantity", r.displayed().quantity().key(), "");
            csv.printRecord("evaluated_pixels", s.count(), "");
            csv.printRecord("evaluated_area", NumberText.mm2(s.areaMm2()), "mm2");
            csv.printRecord("mean", NumberText.of(s.mean()), unit);
            csv.printRecord("harmonic_mean", NumberText.of(s.harmonicMean()), unit);
            csv.printRecord("geometric_mean", NumberText.of(s.geometricMean()), unit);
            csv.printRecord("median", NumberText.sample(s.median()), unit);
            csv.printRecord("non_positive_pixels (in mean, median, percentiles; not in harmonic and geometric mean)",
                    s.nonPositiveCount(), "");
            csv.printRecord("standard_deviation", NumberText.of(s.standardDeviation()), unit);
            csv.printRecord("minimum", NumberText.sample(s.min()), unit);
            csv.printRecord("maximum", NumberText.sample(s.max()), unit);
            for (MapStatistics.PercentileValue p : s.percentiles()) {
                csv.printRecord("p" + trapmap.viewer.model.Units.number(p.percent()), NumberText.sample(p.value()), unit);
            }
            csv.printRecord("lifetime_harmonic_mean", NumberText.of(r.lifetimeStats().harmonicMean()), "us");
            csv.printRecord("lifetime_median", NumberText.sample(r.lifetimeStats().median()), "us");
            csv.printRecord("flagged_area_fraction", NumberText.of(r.flaggedFraction()), "");
            csv.printRecord("flagged_regions", r.regions().size(), "");
            csv.printRecord("edge_exclusion", NumberText.mm(r.edgeExclusionMm()), "mm");
            Verdict v = r.verdict();
            if (v.invalid() != null) {
                csv.printRecord("invalid_area_fraction", NumberText.of(v.invalid().fraction()), "");
                csv.printRecord("invalid_non_finite_pixels", v.invalid().nonFiniteCount(), "");
                csv.printRecord("invalid_non_positive_pixels", v.invalid().nonPositiveCount(), "");
                csv.printRecord("invalid_conversion_pixels", v.invalid().invalidConversionCount(), "");
            }
            csv.printRecord("judged_by", CsvCells.text(v.rulesVerdict() ? "rules " + v.rulesName()
                    : Verdict.QUICK_CHECK), "");
            csv.printRecord("verdict", CsvCells.text(v.outcome()), "");
            csv.printRecord("grade", CsvCells.text(v.grade()), "");
            csv.printRecord("profile", CsvCells.text(v.profile()), "");
            csv.printRecord("defect", v.defectId() == null ? "" : CsvCells.text(v.defectId()), "");
            csv.printRecord("defect_overridden", v.defectOverridden(), "");
            csv.printRecord("failed_rules", CsvCells.text(String.join(";", v.failedRules())), "");
            csv.printRecord("graded_down_by", CsvCells.text(String.join(";", v.gradedDownBy())), "");
            if (v.rulesVerdict()) {
                for (Map.Entry<String, Double> f : v.figures().entrySet()) {
                    csv.printRecord("figure " + f.getKey(), Figure.parse(f.getKey()).text(f.getValue()), "");
                }
            }
        }
        return sw.toString();
    }

    private static String csvUnit(String unit) {
        return unit.replace("µs", "us").replace("^-3", "-3").replace(" ", "");
    }

    /** The report page of a wafer's results as shown: style, mask, flags, outline, conditions, defect, verdict. */
    public static WaferReport.Content reportContent(ViewerModel.OpenWafer w, WaferAnalysis r, DisplayStyle style,
                                                    Defect defect) {
        return WaferPages.of(w.path(), r, style, defect);
    }
}
