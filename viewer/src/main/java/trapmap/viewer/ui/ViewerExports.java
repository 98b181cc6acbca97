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
import trapmap.viewer.report.WaferPages;
import trapmap.viewer.report.WaferReport;
import trapmap.viewer.ui.canvas.DisplayStyle;
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

    /** The report page of a wafer's results as shown: style, mask, flags, outline, conditions, defect, verdict. */
    public static WaferReport.Content reportContent(ViewerModel.OpenWafer w, WaferAnalysis r, DisplayStyle style,
                                                    Defect defect) {
        return WaferPages.of(w.path(), r, style, defect);
    }
}
