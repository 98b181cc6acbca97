package trapmap.viewer.ui;

import java.io.IOException;
import java.io.StringWriter;
import java.nio.file.Path;
import trapmap.maps.io.AtomicFiles;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import trapmap.maps.region.Region;
import trapmap.physics.defect.Defect;
import trapmap.viewer.report.WaferReport;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.ui.model.Analysis;
import trapmap.viewer.ui.model.DisplayedQuantity;
import trapmap.viewer.ui.model.ViewerModel;
import trapmap.viewer.ui.model.WaferAnalysis;

/** What the window exports, built from model results without a display: region tables, report pages, files. */
public final class ViewerExports {
    private ViewerExports() {
    }

    /** Writes bytes atomically: a temporary file beside the target, then a rename. */
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
                csv.printRecord(g.id(), g.areaMm2(), g.centroidXMm(), g.centroidYMm(), g.peakValue(), g.peakXMm(),
                        g.peakYMm(), g.meanValue(), g.edgeDistanceMm());
            }
        }
        return sw.toString();
    }

    /** The report page of a wafer's results as shown: style, mask, flags, outline, conditions, defect, notes. */
    public static WaferReport.Content reportContent(ViewerModel.OpenWafer w, WaferAnalysis r, DisplayStyle style,
                                             Defect defect) {
        Analysis a = r.analysis();
        List<String> notes = new ArrayList<>();
        notes.add(String.format(Locale.ROOT, "%s: flagged regions cover %s of the evaluated area (%d regions; pixels %s"
                + " %s %s, regions of at least %s mm^2); pass up to %s", r.pass() ? "PASS" : "FAIL",
                trapmap.viewer.ui.model.Units.percent(r.flaggedFraction()), r.regions().size(),
                a.threshold().side().name().toLowerCase(Locale.ROOT), trapmap.viewer.ui.model.Units.number(
                a.threshold().value()), a.quantity().quantity().unit(), trapmap.viewer.ui.model.Units.number(
                a.threshold().minAreaMm2()), trapmap.viewer.ui.model.Units.percent(a.threshold()
                .maxFlaggedFraction())));
        notes.add(String.format(Locale.ROOT, "harmonic-mean lifetime %.1f µs, median %.1f µs over %.0f mm^2 (edge"
                + " exclusion %s mm)", r.lifetimeStats().harmonicMean(), r.lifetimeStats().median(),
                r.lifetimeStats().areaMm2(), trapmap.viewer.ui.model.Units.number(a.edgeExclusionMm())));
        r.warnings().forEach(x -> notes.add("caution: " + x.message()));
        return WaferReport.Content.of(r.displayed(), w.path().toString()).withStyle(style)
                .withStatisticsMask(r.mask()).withFlags(a.threshold().value(), r.flagged(), r.regions())
                .withOutline(r.shape(), a.edgeExclusionMm()).withConditions(r.lifetime().conditions())
                .withDefect(a.quantity() == DisplayedQuantity.LIFETIME ? null : defect).withNotes(notes);
    }
}
