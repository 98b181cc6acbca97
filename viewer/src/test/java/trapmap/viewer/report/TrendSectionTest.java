package trapmap.viewer.report;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.EnumSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import org.jfree.chart.JFreeChart;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.RunRule;
import trapmap.maps.trend.TrendSettings;
import trapmap.store.BatchTrend;
import trapmap.store.ResultsStore;
import trapmap.store.RunInfo;
import trapmap.store.WaferRecord;

/** The trend page: the batch's points ringed on the chart, the signals listed, a trend without charts explained. */
class TrendSectionTest {
    private static final String FIGURE = "median_lifetime_us";

    @TempDir
    Path dir;

    private WaferRecord wafer(int i, double value) throws Exception {
        String name = String.format("W%03d", i);
        Path f = dir.resolve(name + ".tif");
        Files.writeString(f, name);
        Files.writeString(dir.resolve(name + ".json"), "{\"wafer_id\": \"" + name + "\", \"conditions\": {"
                + "\"measured_at\": \"" + Instant.parse("2026-10-01T08:00:00Z").plus(Duration.ofHours(i)) + "\"}}");
        Map<String, Double> figures = new LinkedHashMap<>();
        figures.put(FIGURE, value);
        return WaferRecord.of(new WaferResult(f.toString(), name, WaferResult.Status.PASS, "A", "default", "",
                figures, List.of(), List.of(), List.of(), "", null), null);
    }

    @Test
    void theBatchsPointsAreRingedAndItsSignalsListed() throws Exception {
        try (ResultsStore s = ResultsStore.open(dir.resolve("r.db").toString())) {
            RunInfo info = new RunInfo(Instant.parse("2026-11-30T10:00:00Z"), "rules.json", "r1", "{}", "s0", "t");
            String earlier = s.startRun(info);
            for (int i = 0; i < 20; i++) {
                s.write(earlier, wafer(i, 100 + (i * 7) % 5));
            }
            String batch = s.startRun(info);
            List<String> files = new ArrayList<>();
            for (int i = 20; i < 24; i++) {
                WaferRecord w = wafer(i, i == 22 ? 160 : 100 + (i * 7) % 5); // one wafer far above its limits
                s.write(batch, w);
                files.add(w.result().file());
            }
            TrendSettings settings = new TrendSettings(FIGURE, "none", Baseline.first(20),
                    EnumSet.of(RunRule.BEYOND_3_SIGMA));
            BatchTrend t = BatchTrend.of(s, settings, batch, files);
            ControlChart x = t.valueCharts().get(0);
            JFreeChart chart = TrendSection.chart(t, x);
            XYSeriesCollection ds = (XYSeriesCollection) chart.getXYPlot().getDataset();
            XYSeries ringed = ds.getSeries(TrendSection.THIS_RUN_SERIES);
            assertThat(ringed.getItemCount()).isEqualTo(4);
            assertThat(ringed.getY(2).doubleValue()).isEqualTo(160);
            assertThat(ringed.getX(0).longValue()).isEqualTo(x.points().get(20).time().toEpochMilli());

            try (PDDocument doc = new PDDocument(); ReportFlow flow = new ReportFlow(doc)) {
                TrendSection.draw(flow, t);
                flow.close();
                String text = new PDFTextStripper().getText(doc).replace("\n", " ");
                assertThat(text).contains("Trend over the results store: " + FIGURE, "24 stored wafers",
                        "individuals (X): 1 point(s) with a signal after the baseline, 1 of this run; 1 by an alarm"
                                + " rule (beyond_3_sigma)", "1 point beyond 3 sigma (up)", "160");
            }
        }
    }

    @Test
    void aTrendWithoutChartsSaysWhy() throws Exception {
        BatchTrend t = BatchTrend.failed(TrendSettings.defaults(FIGURE), "r.db", "the baseline holds 1 wafer\nonly");
        try (PDDocument doc = new PDDocument(); ReportFlow flow = new ReportFlow(doc)) {
            TrendSection.draw(flow, t);
            flow.close();
            String text = new PDFTextStripper().getText(doc).replace("\n", " ");
            assertThat(text).contains("No trend: the baseline holds 1 wafer only", "Control limits describe");
            assertThat(doc.getNumberOfPages()).isOne();
        }
    }
}
