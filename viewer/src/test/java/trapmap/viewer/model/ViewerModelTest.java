package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferInspection;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.model.Quantity;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.RegionTable;
import trapmap.maps.region.ThresholdRegions;

class ViewerModelTest {
    static final Path DEMO = Path.of("..", "demo-data").toAbsolutePath().normalize();
    static final Path W03 = DEMO.resolve("LOT-A01-W03.tif");

    @BeforeAll
    static void demoSetIsThere() {
        assertThat(W03).as("run from the viewer module directory").exists();
    }

    private static ViewerModel opened(Path... files) {
        ViewerModel m = new ViewerModel();
        ViewerModel.OpenOutcome o = m.open(List.of(files));
        assertThat(o.errors()).isEmpty();
        return m;
    }

    @Test
    void lifetimeFiguresEqualTheBatchEngines() throws Exception {
        Rules rules = Rules.parse("""
                {"defect": "fe-i", "edge_exclusion_mm": 2,
                 "flag": {"quantity": "lifetime", "threshold": 20, "min_area_mm2": 4},
                 "limits": {"p5_lifetime_us": {"min": 1}}}""", "rules.json");
        WaferResult batch = new WaferInspection(rules).inspect(W03);
        assertThat(batch.status()).isNotEqualTo(WaferResult.Status.ERROR);

        ViewerModel m = opened(W03);
        m.setAnalysis(Analysis.DEFAULT.withThreshold(new ThresholdRule(20, RegionCriteria.Side.BELOW, 4, 0.02))
                .withEdgeExclusion(2), "threshold");
        WaferAnalysis r = m.compute(0, () -> false);

        assertThat(r.lifetimeStats().harmonicMean()).isEqualTo(batch.figures().get("harmonic_mean_lifetime_us"));
        assertThat(r.lifetimeStats().median()).isEqualTo(batch.figures().get("median_lifetime_us"));
        assertThat(r.lifetimeStats().percentile(5)).isEqualTo(batch.figures().get("p5_lifetime_us"));
        assertThat(r.flaggedFraction()).isEqualTo(batch.figures().get("flagged_area_fraction"))
                .isGreaterThan(0);
        assertThat(r.largestRegionMm2()).isEqualTo(batch.figures().get("largest_region_mm2"));
    }

    @Test
    void trapDensityFiguresEqualTheBatchEngines() throws Exception {
        Rules rules = Rules.parse("""
                {"defect": "fe-i", "edge_exclusion_mm": 3,
                 "flag": {"quantity": "trap-density", "threshold": 3e11, "min_area_mm2": 2},
                 "limits": {"trap_density_p95_cm3": {"max": 1e12}}}""", "rules.json");
        WaferResult batch = new WaferInspection(rules).inspect(W03);

        ViewerModel m = opened(W03);
        m.setAnalysis(Analysis.DEFAULT.withQuantity(DisplayedQuantity.TRAP_DENSITY)
                .withThreshold(new ThresholdRule(3e11, RegionCriteria.Side.ABOVE, 2, 0.02)).withEdgeExclusion(3),
                "settings");
        WaferAnalysis r = m.compute(0, () -> false);

        assertThat(r.displayedStats().percentile(95)).isEqualTo(batch.figures().get("trap_density_p95_cm3"));
        assertThat(r.flaggedFraction()).isEqualTo(batch.figures().get("flagged_area_fraction"));
        assertThat(r.largestRegionMm2()).isEqualTo(batch.figures().get("largest_region_mm2"));
    }

    @Test
    void flaggedRegionsAreThoseOfThresholdRegions() {
        ViewerModel m = opened(W03);
        WaferAnalysis r = m.compute(0, () -> false);
        RegionTable direct = ThresholdRegions.find(r.lifetime(), r.mask(), RegionCriteria.below(20, 4), r.shape());
        assertThat(r.regions().size()).isEqualTo(direct.size()).isGreaterThan(0);
        assertThat(r.regions().totalAreaMm2()).isEqualTo(direct.totalAreaMm2());
        assertThat(r.flagged().cardinality()).isEqualTo(r.regions().regions().stream()
                .mapToInt(trapmap.maps.region.Region::pixelCount).sum());
    }

    @Test
    void raisingTheThresholdFlagsMore() {
        ViewerModel m = opened(W03);
        WaferAnalysis low = m.compute(0, () -> false);
        m.setAnalysis(m.analysis().withThreshold(m.analysis().threshold().withValue(60)), "threshold");
        assertThat(m.upToDate(0)).isFalse();
        WaferAnalysis high = m.compute(0, () -> false);
        assertThat(high.flaggedFraction()).isGreaterThan(low.flaggedFraction());
        assertThat(high.conversion()).as("conversion reused when only the threshold changes")
                .isSameAs(low.conversion());
    }

    @Test
    void changingTheDefectReconverts() {
        ViewerModel m = opened(W03);
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.TRAP_DENSITY), "quantity");
        WaferAnalysis fe = m.compute(0, () -> false);
        m.setAnalysis(m.analysis().withDefect("cr-i"), "defect");
        WaferAnalysis cr = m.compute(0, () -> false);
        assertThat(cr.conversion()).isNotSameAs(fe.conversion());
        assertThat(cr.conversion().defectId()).isEqualTo("cr-i");
        assertThat(cr.displayedStats().median()).isNotEqualTo(fe.displayedStats().median());
    }

    @Test
    void changingTheConditionsReconverts() {
        ViewerModel m = opened(W03);
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.TRAP_DENSITY), "quantity");
        WaferAnalysis before = m.compute(0, () -> false);
        m.setAnalysis(m.analysis().withConditions(m.analysis().conditions().withInjection(1e15)), "conditions");
        WaferAnalysis after = m.compute(0, () -> false);
        assertThat(after.lifetime().conditions().injectionPerCm3()).isEqualTo(1e15);
        assertThat(after.displayedStats().median()).isNotEqualTo(before.displayedStats().median());
    }

    @Test
    void undoAndRedoStepThroughThresholdAndLineEdits() {
        ViewerModel m = new ViewerModel();
        Analysis start = m.analysis();
        m.setAnalysis(start.withThreshold(start.threshold().withValue(35)), "threshold");
        Analysis withThreshold = m.analysis();
        m.setAnalysis(withThreshold.withLine(new ProfileLine(-50, 0, 50, 0, 2)), "line");
        assertThat(m.undoName()).isEqualTo("line");

        assertThat(m.undo()).isTrue();
        assertThat(m.analysis()).isEqualTo(withThreshold);
        assertThat(m.undo()).isTrue();
        assertThat(m.analysis()).isEqualTo(start);
        assertThat(m.undo()).isFalse();
        assertThat(m.redo()).isTrue();
        assertThat(m.analysis().threshold().value()).isEqualTo(35);
        m.setAnalysis(m.analysis().withEdgeExclusion(5), "edge exclusion");
        assertThat(m.canRedo()).as("a new edit drops the redo branch").isFalse();
    }

    @Test
    void nextAndPreviousWrapRound() {
        ViewerModel m = opened(DEMO.resolve("LOT-A01-W01.tif"), DEMO.resolve("LOT-A01-W02.tif"), W03);
        assertThat(m.selectedIndex()).isZero();
        m.next();
        m.next();
        assertThat(m.selected().name()).isEqualTo("LOT-A01-W03");
        m.next();
        assertThat(m.selectedIndex()).isZero();
        m.previous();
        assertThat(m.selectedIndex()).isEqualTo(2);
    }

    @Test
    void aFolderOpensItsMapsButNotTheSidecars() {
        ViewerModel m = opened(DEMO);
        assertThat(m.size()).isEqualTo(17);
        assertThat(m.wafers()).allSatisfy(w -> assertThat(w.path().toString()).endsWith(".tif"));
        assertThat(m.open(List.of(W03)).added()).as("already open").isZero();
    }

    @Test
    void unreadableFileIsReportedByName(@org.junit.jupiter.api.io.TempDir Path dir) throws Exception {
        Path bad = dir.resolve("broken.tif");
        java.nio.file.Files.writeString(bad, "not a tiff");
        ViewerModel.OpenOutcome o = new ViewerModel().open(List.of(bad));
        assertThat(o.added()).isZero();
        assertThat(o.errors()).singleElement().asString().contains("broken.tif");
    }

    @Test
    void probeGivesTheSinglePixelConversionOfTheMap() {
        ViewerModel m = opened(W03);
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.TRAP_DENSITY), "quantity");
        WaferAnalysis r = m.compute(0, () -> false);
        int x = r.lifetime().width() / 2;
        int y = r.lifetime().height() / 2;
        PixelReadout p = m.probe(x, y);
        double fromMap = r.conversion().get(Quantity.TRAP_DENSITY).raster().get(x, y);
        assertThat(p.value()).isEqualTo(fromMap);
        assertThat(p.pixel().trapDensityPerCm3()).isCloseTo(fromMap, within(Math.abs(fromMap) * 1e-6));
        assertThat(p.pixel().trapDensityMinPerCm3()).isLessThanOrEqualTo(p.pixel().trapDensityPerCm3());
        assertThat(p.describe()).contains("mm").contains("cm⁻³").contains("Δn").contains("f_t");
        assertThat(m.probe(-1, 0)).isNull();
    }

    @Test
    void autoRangeIsP1ToP99AndStaysPositiveOnALogScale() {
        ViewerModel m = opened(W03);
        WaferAnalysis r = m.compute(0, () -> false);
        double[] range = ViewerModel.range(r, DisplaySettings.DEFAULT);
        assertThat(range[0]).isEqualTo(r.lifetimeStats().percentile(1));
        assertThat(range[1]).isEqualTo(r.lifetimeStats().percentile(99));
        double[] manual = ViewerModel.range(r, DisplaySettings.DEFAULT.withLogarithmic(true).withManualRange(-5, 100));
        assertThat(manual[0]).isPositive();
        assertThat(manual[1]).isEqualTo(100);
    }

    @Test
    void aQuantityNeedingADefectWithoutOneIsRefused() {
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> Analysis.DEFAULT.withDefect(null)
                .withQuantity(DisplayedQuantity.TRAP_DENSITY)).hasMessageContaining("needs a defect");
    }

    @Test
    void listenersHearChanges() {
        ViewerModel m = new ViewerModel();
        List<ViewerModel.Change> heard = new java.util.ArrayList<>();
        m.addListener(heard::add);
        m.open(List.of(W03));
        m.setAnalysis(m.analysis().withEdgeExclusion(4), "edge exclusion");
        m.compute(0, () -> false);
        assertThat(heard).containsSubsequence(ViewerModel.Change.WAFERS, ViewerModel.Change.SELECTION,
                ViewerModel.Change.ANALYSIS, ViewerModel.Change.RESULTS);
    }

    @Test
    void cancelledAnalysisStopsWithoutResults() {
        ViewerModel m = opened(W03);
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> m.compute(0, () -> true))
                .isInstanceOf(java.util.concurrent.CancellationException.class);
        assertThat(m.wafer(0).result()).isNull();
    }
}
