package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RulesException;
import trapmap.maps.batch.WaferInspection;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.region.RegionCriteria;

/** The viewer's judgement: with a rules file the batch's verdicts, without one the labelled quick threshold check. */
class ViewerModelRulesTest {
    static final Path DEMO = ViewerModelTest.DEMO;
    static final Path RULES = DEMO.resolve("rules-example.json");
    static final Path W01 = DEMO.resolve("LOT-A01-W01.tif");

    private static ViewerModel openedDemo() {
        ViewerModel m = new ViewerModel();
        assertThat(m.open(List.of(DEMO)).errors()).isEmpty();
        return m;
    }

    private static void computeAll(ViewerModel m) {
        m.computeAll(() -> false, i -> { });
        for (int i = 0; i < m.size(); i++) {
            assertThat(m.wafer(i).error()).as("wafer %s", m.wafer(i).name()).isNull();
            assertThat(m.upToDate(i)).isTrue();
        }
    }

    @Test
    void everyDemoWaferGetsTheBatchVerdictGradeProfileAndDefect() throws Exception {
        ViewerModel m = openedDemo();
        m.loadRules(RULES);
        computeAll(m);
        WaferInspection batch = new WaferInspection(Rules.read(RULES));
        for (ViewerModel.OpenWafer w : m.wafers()) {
            WaferResult expected = batch.inspect(w.path());
            Verdict v = w.result().verdict();
            assertThat(v.rulesVerdict()).isTrue();
            assertThat(v.pass()).as(w.name()).isEqualTo(expected.status() == WaferResult.Status.PASS);
            assertThat(v.grade()).as(w.name()).isEqualTo(expected.grade());
            assertThat(v.profile()).as(w.name()).isEqualTo(expected.profile());
            assertThat(v.defectId()).as(w.name()).isEqualTo(expected.defectId());
            assertThat(v.failedRules()).as(w.name()).isEqualTo(expected.failed());
            assertThat(v.gradedDownBy()).as(w.name()).isEqualTo(expected.gradedDownBy());
            assertThat(v.figures()).as(w.name()).isEqualTo(expected.figures());
            assertThat(w.result().flaggedFraction()).isEqualTo(expected.figures().get("flagged_area_fraction"));
            assertThat(w.result().regions().size()).isEqualTo(expected.regions().size());
            assertThat(v.defectOverridden()).isFalse();
        }
        assertThat(m.tally()).isEqualTo(new ViewerModel.Tally(4, 13, 0));
        assertThat(m.judgedBy()).isEqualTo("rules rules-example.json");
        assertThat(m.wafer(0).result().verdict().conditionsOverridden()).isFalse();

        m.setAnalysis(m.analysis().withConditions(new ConditionOverrides(null, null, null, null, null, 100.0)), "c");
        WaferAnalysis typed = m.compute(0, () -> false);
        assertThat(typed.verdict().conditionsOverridden()).isTrue();
        assertThat(typed.verdict().basis()).endsWith("with conditions typed into the viewer");
    }

    @Test
    void nTypeWafersAreConvertedWithTheirProfilesDefect() throws Exception {
        ViewerModel m = openedDemo();
        m.loadRules(RULES);
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.TRAP_DENSITY), "quantity");
        computeAll(m);
        WaferAnalysis n = m.wafer(m.indexOf(DEMO.resolve("LOT-N01-W01.tif"))).result();
        assertThat(n.conversion().defectId()).isEqualTo("midgap");
        assertThat(n.verdict().profile()).isEqualTo("n-type");
        assertThat(n.flagThreshold()).isEqualTo(1e12);
        // with fe-i the n-type wafer would be flagged nearly everywhere; its profile's defect flags a few percent
        assertThat(n.flaggedFraction()).isLessThan(0.2);
        WaferAnalysis p = m.wafer(m.indexOf(W01)).result();
        assertThat(p.conversion().defectId()).isEqualTo("fe-i");
        assertThat(p.verdict().headline()).isEqualTo("pass · grade A");
    }

    @Test
    void anOverriddenDefectJudgesOneWaferAndSaysSo() throws Exception {
        ViewerModel m = openedDemo();
        m.loadRules(RULES);
        int i = m.indexOf(W01);
        m.setDefectOverride(i, "cr-i");
        assertThat(m.upToDate(i)).isFalse();
        computeAll(m);
        Verdict v = m.wafer(i).result().verdict();
        WaferInspection.Evaluation expected = new WaferInspection(Rules.read(RULES)).judge(W01.getFileName()
                .toString(), m.wafer(i).map(), trapmap.physics.defect.DefectLibrary.byId("cr-i"));
        assertThat(v.defectId()).isEqualTo("cr-i");
        assertThat(v.defectOverridden()).isTrue();
        assertThat(v.grade()).isEqualTo(expected.result().grade());
        assertThat(v.figures()).isEqualTo(expected.result().figures());
        assertThat(v.rows()).anySatisfy(r -> assertThat(r[1]).contains("overridden defect"));
        assertThat(m.wafer(m.indexOf(DEMO.resolve("LOT-A01-W08.tif"))).result().verdict().defectOverridden())
                .isFalse();

        m.setDefectOverrideAll("midgap");
        computeAll(m);
        assertThat(m.wafer(i).result().verdict().defectId()).as("a wafer's own override wins").isEqualTo("cr-i");
        assertThat(m.wafer(m.indexOf(DEMO.resolve("LOT-A01-W08.tif"))).result().verdict().defectId())
                .isEqualTo("midgap");
        assertThatThrownBy(() -> m.setDefectOverride(i, "no-such-defect")).hasMessageContaining("no-such-defect");
    }

    @Test
    void withoutRulesTheQuickThresholdCheckJudgesAndIsLabelledSo() {
        ViewerModel m = openedDemo();
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.TRAP_DENSITY)
                .withThreshold(new ThresholdRule(3e11, RegionCriteria.Side.ABOVE, 4, 0.02)).withEdgeExclusion(2), "t");
        computeAll(m);
        WaferAnalysis r = m.wafer(m.indexOf(W01)).result();
        Verdict v = r.verdict();
        assertThat(v.rulesVerdict()).isFalse();
        assertThat(v.grade()).isEmpty();
        assertThat(v.pass()).isEqualTo(r.flaggedFraction() <= 0.02);
        assertThat(v.headline()).startsWith("quick threshold check: ");
        assertThat(v.basis()).contains("not a rules verdict");
        assertThat(m.judgedBy()).startsWith(Verdict.QUICK_CHECK);
        ViewerModel.Tally t = m.tally();
        assertThat(t.pass() + t.fail()).isEqualTo(17);

        m.setDefectOverride(0, "midgap");
        computeAll(m);
        assertThat(m.wafer(0).result().conversion().defectId()).isEqualTo("midgap");
        assertThat(m.wafer(0).result().verdict().defectOverridden()).isTrue();
    }

    @Test
    void droppingTheRulesGoesBackToTheQuickCheck() throws Exception {
        ViewerModel m = new ViewerModel();
        m.open(List.of(W01));
        m.loadRules(RULES);
        assertThat(m.compute(0, () -> false).verdict().rulesVerdict()).isTrue();
        m.setRules(null);
        assertThat(m.upToDate(0)).isFalse();
        assertThat(m.compute(0, () -> false).verdict().rulesVerdict()).isFalse();
    }

    @Test
    void anInvalidRulesFileChangesNothingAndNamesTheField(@TempDir Path dir) throws Exception {
        ViewerModel m = new ViewerModel();
        Path bad = dir.resolve("bad.json");
        Files.writeString(bad, "{\"flag\": {\"quantity\": \"lifetime\", \"threshold\": -5}}");
        assertThatThrownBy(() -> m.loadRules(bad)).isInstanceOf(RulesException.class)
                .hasMessageContaining("bad.json").hasMessageContaining("threshold");
        assertThat(m.rules()).isNull();
    }
}
