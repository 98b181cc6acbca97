package trapmap.viewer.ui;

import java.io.File;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.Locale;
import javax.swing.JFileChooser;
import javax.swing.SwingWorker;
import javax.swing.filechooser.FileNameExtensionFilter;
import trapmap.viewer.report.WaferReport;
import trapmap.viewer.ui.canvas.MapCanvas;
import trapmap.viewer.graphics.ChartExport;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.model.WaferAnalysis;
import trapmap.viewer.ui.panels.ChartTabs;
import trapmap.viewer.ui.panels.StatusBar;

/**
 * The window's exports: the view and a chart as PNG, the region table, the wafer report PDF. It asks for the file
 * and reports the outcome; {@link ViewerExports} builds the content without a display and every file is written
 * atomically.
 */
final class ExportController {
    private final ViewerWindow window;
    private final ViewerModel model;
    private final MapCanvas canvas;
    private final ChartTabs charts;
    private final StatusBar status;

    ExportController(ViewerWindow window, ViewerModel model, MapCanvas canvas, ChartTabs charts, StatusBar status) {
        this.window = window;
        this.model = model;
        this.canvas = canvas;
        this.charts = charts;
        this.status = status;
    }

    private Path askSave(String name, String ext, String description) {
        JFileChooser fc = window.sessions().chooser();
        fc.setFileFilter(new FileNameExtensionFilter(description, ext));
        fc.setSelectedFile(new File(fc.getCurrentDirectory(), name));
        if (fc.showSaveDialog(window) != JFileChooser.APPROVE_OPTION) {
            return null;
        }
        Path p = fc.getSelectedFile().toPath();
        if (!p.getFileName().toString().toLowerCase(Locale.ROOT).endsWith("." + ext)) {
            p = p.resolveSibling(p.getFileName() + "." + ext);
        }
        return p;
    }

    void exportView() {
        ViewerModel.OpenWafer w = model.selected();
        if (w == null) {
            return;
        }
        Path p = askSave(w.name() + "-" + model.analysis().quantity().key() + ".png", "png", "PNG pictures");
        if (p == null) {
            return;
        }
        try {
            WaferAnalysis r = w.result();
            String defectId = r != null && r.conversion() != null ? r.conversion().defectId()
                    : model.analysis().defectId();
            ViewerExports.writeAtomically(p, ViewerExports.viewPng(window.viewImage(),
                    ViewerExports.viewCaption(w, model.analysis().quantity(), defectId,
                            java.time.LocalDate.now(java.time.ZoneOffset.UTC))));
            status.setMessage("view saved to " + p);
        } catch (IOException e) {
            window.error("View not saved", e);
        }
    }

    void exportRegions() {
        ViewerModel.OpenWafer w = model.selected();
        if (w == null || w.result() == null) {
            status.setMessage("no results to export yet");
            return;
        }
        Path p = askSave(w.name() + "-regions.csv", "csv", "CSV tables");
        if (p == null) {
            return;
        }
        try {
            ViewerExports.writeAtomically(p, ViewerExports.regionsCsv(w.result()).getBytes(StandardCharsets.UTF_8));
            status.setMessage(w.result().regions().size() + " regions saved to " + p);
        } catch (IOException e) {
            window.error("Regions not saved", e);
        }
    }

    void exportChart() {
        org.jfree.chart.JFreeChart chart = window.openChart();
        ViewerModel.OpenWafer w = model.selected();
        if (chart == null || w == null) {
            status.setMessage("the open chart tab has no chart yet");
            return;
        }
        String tab = charts.getTitleAt(charts.getSelectedIndex()).toLowerCase(Locale.ROOT).replace(' ', '-');
        Path p = askSave(w.name() + "-" + tab + ".png", "png", "PNG pictures");
        if (p == null) {
            return;
        }
        try {
            ChartExport.writePng(chart, p, 1200, 700);
            status.setMessage("chart saved to " + p);
        } catch (IOException | RuntimeException e) {
            window.error("Chart not saved", e);
        }
    }

    /** Asks for a file and writes the shown wafer's report page (Ctrl+P). */
    void report() {
        ViewerModel.OpenWafer w = model.selected();
        WaferAnalysis r = w == null ? null : w.result();
        if (r == null || canvas.style() == null) {
            status.setMessage("no results to report yet");
            return;
        }
        Path p = askSave(w.name() + "-report.pdf", "pdf", "PDF documents");
        if (p != null) {
            writeReport(p);
        }
    }

    /** Writes the shown wafer's report page to {@code p} in the background (what Ctrl+P does after asking). */
    void writeReport(Path p) {
        ViewerModel.OpenWafer w = model.selected();
        WaferAnalysis r = w == null ? null : w.result();
        if (r == null || canvas.style() == null) {
            status.setMessage("no results to report yet");
            return;
        }
        WaferReport.Content page = ViewerExports.reportContent(w, r, canvas.style(), model.defectOf(r));
        status.setProgress(0, "report");
        new SwingWorker<Void, Void>() {
            @Override
            protected Void doInBackground() throws IOException {
                WaferReport.write(page, p);
                return null;
            }

            @Override
            protected void done() {
                status.setProgress(-1, null);
                try {
                    get();
                    status.setMessage("report saved to " + p);
                } catch (Exception e) {
                    window.error("Report not written", e);
                }
            }
        }.execute();
    }

    /** Saves the shown (converted) map as TIFF with its metadata, or as CSV, by the chosen name's extension. */
    void exportMap() {
        ViewerModel.OpenWafer w = model.selected();
        if (w == null || w.result() == null) {
            status.setMessage("no results to export yet");
            return;
        }
        WaferAnalysis r = w.result();
        JFileChooser fc = window.sessions().chooser();
        fc.setFileFilter(new FileNameExtensionFilter("Maps (.tif with metadata, .csv x_mm,y_mm,value)", "tif", "tiff",
                "csv"));
        fc.setSelectedFile(new File(fc.getCurrentDirectory(), w.name() + "-" + r.displayed().quantity().key()
                + ".tif"));
        if (fc.showSaveDialog(window) != JFileChooser.APPROVE_OPTION) {
            return;
        }
        Path p = fc.getSelectedFile().toPath();
        String n = p.getFileName().toString().toLowerCase(Locale.ROOT);
        if (!n.endsWith(".tif") && !n.endsWith(".tiff") && !n.endsWith(".csv")) {
            p = p.resolveSibling(p.getFileName() + ".tif");
        }
        try {
            ViewerExports.writeMap(r, p);
            status.setMessage(r.displayed().quantity().key() + " map saved to " + p);
        } catch (IOException | RuntimeException e) {
            window.error("Map not saved", e);
        }
    }

    /** Saves the statistics table of the shown wafer, with its verdict, as CSV. */
    void exportStatistics() {
        ViewerModel.OpenWafer w = model.selected();
        if (w == null || w.result() == null) {
            status.setMessage("no results to export yet");
            return;
        }
        Path p = askSave(w.name() + "-statistics.csv", "csv", "CSV tables");
        if (p == null) {
            return;
        }
        try {
            ViewerExports.writeAtomically(p, ViewerExports.statisticsCsv(w.result()).getBytes(
                    StandardCharsets.UTF_8));
            status.setMessage("statistics saved to " + p);
        } catch (IOException e) {
            window.error("Statistics not saved", e);
        }
    }
}
