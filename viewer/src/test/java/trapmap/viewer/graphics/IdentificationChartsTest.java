package trapmap.viewer.graphics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.awt.image.BufferedImage;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import javax.imageio.ImageIO;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.annotations.XYAnnotation;
import org.jfree.chart.annotations.XYTextAnnotation;
import org.jfree.chart.plot.IntervalMarker;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.Layer;
import org.jfree.data.xy.XYDataset;
import org.jfree.data.xy.YIntervalSeriesCollection;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.physics.spectroscopy.DpssFit;
import trapmap.physics.spectroscopy.DpssResult;
import trapmap.physics.spectroscopy.LibraryRanking;
import trapmap.physics.spectroscopy.LifetimeCurve;
import trapmap.physics.spectroscopy.Ranking;
import trapmap.physics.spectroscopy.RankingStatus;

/** The identification charts draw the physics module's ranking and DPSS of a planted defect. */
class IdentificationChartsTest {
    private static final Silicon SI = Silicon.at(300);
    private static final Doping DOPING = Doping.pType(1e15);
    private static final double[] LEVELS = {1e13, 1e14, 1e15};
    private static final double NT = 2e11;

    /** τ_SRH of Fe_i at {@link #NT} at the three levels (exact, from the physics module), with 3 % uncertainty. */
    private static LifetimeCurve planted(String id) {
        SrhRecombination srh = SrhRecombination.of(DefectLibrary.byId(id), DOPING, SI);
        double[] tau = new double[LEVELS.length];
        for (int i = 0; i < tau.length; i++) {
            tau[i] = srh.lifetimeS(LEVELS[i], NT);
        }
        return LifetimeCurve.of(LEVELS, tau);
    }

    private static Ranking rank(LifetimeCurve c) {
        return new LibraryRanking(DefectLibrary.all(), DOPING, SI, LEVELS).rank(c.tauSrhS(), c.relativeUncertainty());
    }

    @Test
    void fitCurvesHoldTheMeasuredBarsAndThePhysicsCurvesOfTheBestThree() {
        LifetimeCurve c = planted("fe-i");
        Ranking r = rank(c);
        FitCurves f = FitCurves.of(c, r, DOPING, SI);
        assertThat(f.points()).hasSize(3);
        for (int i = 0; i < 3; i++) {
            FitCurves.Point p = f.points().get(i);
            assertThat(p.injectionPerCm3()).isEqualTo(LEVELS[i]);
            assertThat(p.tauUs()).isCloseTo(c.tauSrhS()[i] * 1e6, within(1e-9 * p.tauUs()));
            assertThat(p.lowUs()).isCloseTo(p.tauUs() * 0.97, within(1e-9 * p.tauUs()));
            assertThat(p.highUs()).isCloseTo(p.tauUs() * 1.03, within(1e-9 * p.tauUs()));
        }
        assertThat(f.candidates()).hasSize(3);
        assertThat(f.candidates().get(0).fit().id()).isEqualTo("fe-i");
        assertThat(f.candidates().get(0).fit()).isSameAs(r.hint().best());
        assertThat(f.candidates().get(1).fit()).isSameAs(r.hint().runnerUp());
        assertThat(f.minInjectionPerCm3()).isCloseTo(1e13 / FitCurves.WIDEN, within(1e-3));
        assertThat(f.maxInjectionPerCm3()).isCloseTo(1e15 * FitCurves.WIDEN, within(1e3));
        // the best curve is τ_SRH = K/N_t at the fitted N_t: it passes through the planted points
        FitCurves.Candidate best = f.candidates().get(0);
        SrhRecombination srh = SrhRecombination.of(DefectLibrary.byId("fe-i"), DOPING, SI);
        double[] x = best.injectionPerCm3();
        double[] y = best.tauUs();
        assertThat(x[0]).isCloseTo(f.minInjectionPerCm3(), within(1e-6 * x[0]));
        assertThat(x[x.length - 1]).isCloseTo(f.maxInjectionPerCm3(), within(1e-6 * x[x.length - 1]));
        for (int i = 0; i < x.length; i++) {
            assertThat(y[i]).isCloseTo(srh.lifetimeS(x[i], NT) * 1e6, within(1e-6 * y[i]));
        }
        assertThat(best.label()).contains("fe-i", "N_t = 2e11 cm⁻³", "χ² = ", "(ν = 2)", "p = ");
    }

    @Test
    void unusableLevelsAreNotDrawnButCounted() {
        LifetimeCurve good = planted("fe-i");
        double[] tau = good.tauSrhS();
        tau[2] = Double.NaN;
        LifetimeCurve c = LifetimeCurve.of(LEVELS, tau);
        Ranking r = rank(c);
        assertThat(r.status()).isEqualTo(RankingStatus.BELOW_LIMIT);
        FitCurves f = FitCurves.of(c, r, DOPING, SI, 2);
        assertThat(f.points()).hasSize(2);
        assertThat(f.unusable()).containsExactly(1e15);
        assertThat(f.candidates()).hasSize(2);
        JFreeChart chart = IdentificationCharts.lifetimeFit(f);
        assertThat(subtitles(chart)).contains("1 level(s) without a finite positive τ_SRH not drawn");
    }

    @Test
    void lifetimeChartShowsPointsWithBarsAndALegendLinePerCandidate() {
        LifetimeCurve c = planted("fe-i");
        FitCurves f = FitCurves.of(c, rank(c), DOPING, SI);
        JFreeChart chart = IdentificationCharts.lifetimeFit(f);
        XYDataset pts = chart.getXYPlot().getDataset(0);
        assertThat(pts).isInstanceOf(YIntervalSeriesCollection.class);
        YIntervalSeriesCollection bars = (YIntervalSeriesCollection) pts;
        assertThat(bars.getItemCount(0)).isEqualTo(3);
        assertThat(bars.getStartYValue(0, 1)).isCloseTo(f.points().get(1).lowUs(), within(1e-12));
        assertThat(bars.getEndYValue(0, 1)).isCloseTo(f.points().get(1).highUs(), within(1e-12));
        assertThat(chart.getXYPlot().getDataset(1).getSeriesCount()).isEqualTo(3);
        List<String> legend = new ArrayList<>();
        var items = chart.getXYPlot().getLegendItems();
        for (int i = 0; i < items.getItemCount(); i++) {
            legend.add(items.get(i).getLabel());
        }
        assertThat(legend).hasSize(4);
        assertThat(legend.get(1)).startsWith("fe-i (").contains("N_t = ", "cm⁻³", "χ² = ", "p = ");
        assertThat(chart.getXYPlot().getDomainAxis().getLabel()).contains("cm⁻³");
        assertThat(chart.getXYPlot().getRangeAxis().getLabel()).contains("µs");
        // every drawn point lies within the axes' ranges
        for (FitCurves.Point p : f.points()) {
            assertThat(chart.getXYPlot().getRangeAxis().getRange().contains(p.highUs())).isTrue();
            assertThat(chart.getXYPlot().getRangeAxis().getRange().contains(p.lowUs())).isTrue();
        }
        assertThat(subtitles(chart)).contains("fe-i fits best");
    }

    @Test
    void dpssChartShadesTheBandAndMarksEveryLibraryDefectWithItsLabel() {
        LifetimeCurve c = planted("fe-i");
        List<Defect> lib = DefectLibrary.all();
        DpssResult d = new DpssFit(DOPING, SI, LEVELS).fit(c, lib);
        JFreeChart chart = IdentificationCharts.dpss(d);
        var plot = chart.getXYPlot();
        List<IntervalMarker> bands = new ArrayList<>();
        for (Object o : plot.getDomainMarkers(Layer.BACKGROUND)) {
            bands.add((IntervalMarker) o);
        }
        assertThat(bands).hasSameSizeAs(d.band());
        for (int i = 0; i < bands.size(); i++) {
            assertThat(bands.get(i).getStartValue()).isEqualTo(d.band().get(i)[0]);
        }
        List<String> labels = new ArrayList<>();
        for (XYAnnotation a : plot.getAnnotations()) {
            labels.add(((XYTextAnnotation) a).getText().trim());
        }
        long finiteK = d.defects().stream().filter(x -> x.libraryRatio() > 0
                && Double.isFinite(x.libraryRatio())).count();
        assertThat(labels).hasSize((int) finiteK).contains("fe-i");
        // the planted defect lies on the curve: it is in the second (filled) library series
        var library = plot.getDataset(1);
        assertThat(library.getSeriesKey(1).toString()).contains("on the curve");
        boolean feOnCurve = d.defects().stream().anyMatch(x -> x.onCurve() && x.defect().id().equals("fe-i"));
        assertThat(feOnCurve).isTrue();
        assertThat(library.getItemCount(1)).isEqualTo(d.onCurve().size());
        // two halves, each only on its side of E_i
        var curves = plot.getDataset(0);
        assertThat(curves.getSeriesCount()).isEqualTo(2);
        for (int i = 0; i < curves.getItemCount(0); i++) {
            assertThat(curves.getXValue(0, i)).isNotPositive();
        }
        for (int i = 0; i < curves.getItemCount(1); i++) {
            assertThat(curves.getXValue(1, i)).isNotNegative();
        }
        assertThat(subtitles(chart)).contains(IdentificationCharts.note(d), Labels.prose(d.reason()));
        assertThat(IdentificationCharts.note(d).startsWith("Ambiguous half")).isEqualTo(d.ambiguousHalf());
    }

    @Test
    void halfNoteFollowsTheFit() {
        trapmap.physics.spectroscopy.DpssPoint lo = new trapmap.physics.spectroscopy.DpssPoint(-0.2, 1e-5, 2e-5, 3,
                0.5);
        trapmap.physics.spectroscopy.DpssPoint hi = new trapmap.physics.spectroscopy.DpssPoint(0.2, 1e-5, 2e-5, 3,
                9);
        DpssResult below = new DpssResult(3, List.of(lo, hi), lo, List.<double[]>of(new double[] {-0.2, -0.2}),
                new double[] {3, 3}, lo, hi, false, List.of(), "least chi2 0.5");
        assertThat(IdentificationCharts.note(below)).startsWith("E_t below E_i").contains("lower half");
        DpssResult none = new DpssFit(DOPING, SI, LEVELS).fit(LifetimeCurve.of(LEVELS, new double[] {1e-4, -1, -1}),
                DefectLibrary.all());
        assertThat(IdentificationCharts.note(none)).contains("too few usable levels");
        JFreeChart chart = IdentificationCharts.dpss(none);
        assertThat(chart.getXYPlot().getDataset(0).getSeriesCount()).isZero();
        assertThat(subtitles(chart)).contains(Labels.prose(none.reason()));
    }

    @Test
    void emptyChartsDrawAndNullIsAllowed() {
        BufferedImage a = ChartExport.image(IdentificationCharts.lifetimeFit(null), 400, 300, 1);
        BufferedImage b = ChartExport.image(IdentificationCharts.dpss(null), 400, 300, 1);
        assertThat(a.getWidth()).isEqualTo(400);
        assertThat(b.getHeight()).isEqualTo(300);
    }

    @Test
    void bothChartsExportAsPng(@TempDir Path dir) throws Exception {
        LifetimeCurve c = planted("cr-i");
        Ranking r = rank(c);
        Path fit = dir.resolve("fit.png");
        Path dpss = dir.resolve("dpss.png");
        ChartExport.writePng(IdentificationCharts.lifetimeFit(FitCurves.of(c, r, DOPING, SI)), fit, 900, 600);
        ChartExport.writePng(IdentificationCharts.dpss(new DpssFit(DOPING, SI, LEVELS).fit(c, DefectLibrary.all())),
                dpss, 900, 600);
        assertThat(ImageIO.read(fit.toFile()).getWidth()).isEqualTo(900);
        assertThat(ImageIO.read(dpss.toFile()).getHeight()).isEqualTo(600);
        assertThat(Files.list(dir)).hasSize(2);
    }

    @Test
    void subtitlesShowTheEnginesReasonsWithUnitsAndSymbolsWhileTheReasonsStayAscii() {
        LifetimeCurve c = planted("fe-i");
        Ranking r = rank(c);
        assertThat(r.reason()).contains("cm^-3").contains("chi2");
        String fit = subtitles(IdentificationCharts.lifetimeFit(FitCurves.of(c, r, DOPING, SI)));
        assertThat(fit).contains("fe-i fits best (N_t ").contains(" cm⁻³, χ² ").contains("; runner-up ")
                .contains("(χ² ratio ").doesNotContain("cm^-3").doesNotContain("chi2");
        DpssResult d = new DpssFit(DOPING, SI, LEVELS).fit(c, DefectLibrary.all());
        assertThat(d.reason()).contains("least chi2 ").contains("E_t - E_i");
        String dpss = subtitles(IdentificationCharts.dpss(d));
        assertThat(dpss).contains("least χ² ").contains("E_t − E_i = ").doesNotContain("chi2");
    }

    private static String subtitles(JFreeChart chart) {
        StringBuilder b = new StringBuilder();
        for (int i = 0; i < chart.getSubtitleCount(); i++) {
            if (chart.getSubtitle(i) instanceof TextTitle t) {
                b.append(t.getText()).append('\n');
            }
        }
        return b.toString();
    }
}
