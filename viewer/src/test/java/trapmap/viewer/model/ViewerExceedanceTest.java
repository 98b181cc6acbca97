package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.uncertainty.ConditionUncertainty;
import trapmap.physics.uncertainty.ExceedanceModel;

/**
 * The probability of exceeding N* in the viewer: the displayed map and the cursor readout equal the physics
 * {@link ExceedanceModel} prepared from the wafer's conditions with the analysis's settings; the settings are part of
 * the analysis (undo) and of the session file; a fixed generation rate gives the model's reason, not numbers.
 */
class ViewerExceedanceTest {
    private static final ExceedanceSettings SMALL = ExceedanceSettings.DEFAULT.withSamples(2000).withSeed(7)
            .withThreshold(2e11);

    @TempDir
    Path dir;

    private static ViewerModel opened() {
        ViewerModel m = new ViewerModel();
        m.open(List.of(ViewerModelTest.W03));
        return m;
    }

    private static ExceedanceModel reference(WaferAnalysis r, ExceedanceSettings s) {
        return ExceedanceModel.prepare(MapConversion.physicsConditions(r.lifetime().conditions(),
                ConversionSettings.of(PhysicsSettings.DEFAULTS)), DefectLibrary.byId("fe-i"), PhysicsSettings.DEFAULTS,
                s.uncertainty(), s.thresholdPerCm3(), s.samples(), s.seed());
    }

    @Test
    void probabilityMapEqualsThePhysicsModelPixelByPixel() {
        ViewerModel m = opened();
        m.setAnalysis(Analysis.DEFAULT.withDefect("fe-i").withExceedance(SMALL)
                .withQuantity(DisplayedQuantity.EXCEEDANCE_PROBABILITY), "quantity");
        WaferAnalysis r = m.compute(0, () -> false);
        assertThat(m.wafer(0).error()).isNull();
        ExceedanceModel ref = reference(r, SMALL);
        float[] tau = r.lifetime().raster().samples();
        float[] p = r.displayed().raster().samples();
        int some = 0;
        int none = 0;
        for (int i = 0; i < tau.length; i++) {
            double expected = ref.probability(tau[i]);
            if (Double.isNaN(expected)) {
                assertThat(p[i]).isNaN();
                continue;
            }
            assertThat((double) p[i]).isEqualTo((float) expected);
            some += p[i] > 0.5 ? 1 : 0;
            none += p[i] == 0 ? 1 : 0;
        }
        // the demonstration wafer has both contaminated and clean areas at N* = 2e11 cm⁻³
        assertThat(some).isPositive();
        assertThat(none).isPositive();
        // a probability is coloured on its whole scale unless the user sets a range
        assertThat(ViewerModel.range(r, m.analysis().display())).containsExactly(0, 1);
        // flagged by default where P >= 0.5
        assertThat(m.analysis().threshold().value()).isEqualTo(0.5);
    }

    @Test
    void readoutGivesProbabilityAndQuantilesOfThePixel() {
        ViewerModel m = opened();
        m.setAnalysis(Analysis.DEFAULT.withDefect("fe-i").withExceedance(SMALL), "defect");
        WaferAnalysis r = m.compute(0, () -> false);
        ExceedanceModel ref = reference(r, SMALL);
        int x = r.lifetime().width() / 2;
        int y = r.lifetime().height() / 2;
        float tau = r.lifetime().raster().get(x, y);
        PixelReadout p = m.probe(x, y);
        assertThat(p.exceedance().probability()).isEqualTo(ref.probability(tau));
        assertThat(p.exceedance().lowPerCm3()).isEqualTo(ref.quantile(tau, 0.05));
        assertThat(p.exceedance().highPerCm3()).isEqualTo(ref.quantile(tau, 0.95));
        assertThat(p.exceedance().lowPerCm3()).isLessThan(p.exceedance().highPerCm3());
        String line = p.describe();
        assertThat(line).contains("P(N_t > 2e11 cm⁻³) " + String.format(java.util.Locale.ROOT, "%.3f",
                ref.probability(tau))).contains("N_t 5–95 % [").contains("] cm⁻³");
    }

    @Test
    void newSettingsRecomputeAndUndoRestoresThem() {
        ViewerModel m = opened();
        m.setAnalysis(Analysis.DEFAULT.withDefect("fe-i").withExceedance(SMALL)
                .withQuantity(DisplayedQuantity.EXCEEDANCE_PROBABILITY), "quantity");
        WaferAnalysis first = m.compute(0, () -> false);
        ExceedanceSettings tighter = SMALL.withUncertainty(ConditionUncertainty.NONE).withThreshold(5e11);
        m.setAnalysis(m.analysis().withExceedance(tighter), "exceedance settings");
        assertThat(m.upToDate(0)).isFalse();
        WaferAnalysis second = m.compute(0, () -> false);
        assertThat(second.exceedance().settings()).isEqualTo(tighter);
        // the conversion is kept; only the probability is drawn again
        assertThat(second.conversion()).isSameAs(first.conversion());
        assertThat(second.displayed().raster().samples()).isNotEqualTo(first.displayed().raster().samples());
        assertThat(m.undoName()).isEqualTo("exceedance settings");
        m.undo();
        assertThat(m.analysis().exceedance()).isEqualTo(SMALL);
    }

    @Test
    void fixedGenerationGivesProbabilitiesButNoQuantiles() {
        ViewerModel m = opened();
        m.setAnalysis(Analysis.DEFAULT.withDefect("fe-i").withExceedance(SMALL).withConditions(ConditionOverrides.NONE
                .withGeneration(1e19)), "conditions");
        WaferAnalysis r = m.compute(0, () -> false);
        // the maps module draws the probability under a fixed generation rate, but refuses density quantiles there
        assertThat(r.exceedance().available()).isTrue();
        assertThat(r.exceedance().fixedGeneration()).isTrue();
        int x = r.lifetime().width() / 2;
        int y = r.lifetime().height() / 2;
        double tau = r.lifetime().raster().get(x, y);
        // the physics model prepared apart from the viewer, under the wafer's conditions with the generation rate
        assertThat(r.lifetime().conditions().generationPerCm3PerS()).isEqualTo(1e19);
        double expected = reference(r, SMALL).probability((float) tau);
        assertThat(expected).isBetween(0.0, 1.0);
        assertThat(r.exceedance().probabilityAt(tau)).isEqualTo(expected);
        assertThat(r.exceedance().quantileAt(tau, ExceedanceSettings.LOW_QUANTILE)).isNaN();
        // the readout (on every mouse move) gives the probability and says why there are no quantiles
        PixelReadout p = m.probe(x, y);
        assertThat(p.exceedance().describe()).startsWith("P(N_t > ").contains("N_t quantiles: none under a fixed"
                + " generation rate");
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.EXCEEDANCE_PROBABILITY), "quantity");
        WaferAnalysis shown = m.compute(0, () -> false);
        assertThat(shown.displayed().quantity()).isEqualTo(trapmap.maps.model.Quantity.EXCEEDANCE_PROBABILITY);
    }

    @Test
    void sessionKeepsTheSettings() throws Exception {
        ViewerModel m = opened();
        ExceedanceSettings s = new ExceedanceSettings(new ConditionUncertainty(0.1, 0.03, 0.4, 0.2, 2, 0.05), 4e11,
                5000, 42);
        m.setAnalysis(Analysis.DEFAULT.withDefect("fe-i").withExceedance(s), "exceedance settings");
        Path file = dir.resolve("s.json");
        SessionFiles.write(Session.of(m), file);
        assertThat(SessionFiles.read(file).analysis().exceedance()).isEqualTo(s);
        // an older session without the block takes the defaults
        String text = java.nio.file.Files.readString(file).replaceAll("(?s)\"exceedance\" : \\{.*?\\}\\s*\\},", "");
        assertThat(text).doesNotContain("exceedance");
        assertThat(SessionFiles.parse(text, "old.json", dir).analysis().exceedance())
                .isEqualTo(ExceedanceSettings.DEFAULT);
    }

    @Test
    void sessionErrorsNameTheFieldAndUnit() {
        String base = "{\"format\": \"trapmap-session\", \"version\": 1, \"files\": [], \"exceedance\": %s}";
        assertThatThrownBy(() -> SessionFiles.parse(base.formatted("{\"threshold_cm3\": -1}"), "s.json", dir))
                .hasMessageContaining("s.json").hasMessageContaining("threshold N*").hasMessageContaining("cm^-3");
        // the uncertainty block is read by the physics settings files' parser
        assertThatThrownBy(() -> SessionFiles.parse(base.formatted("{\"uncertainty\": {\"samples\": 2.5}}"),
                "s.json", dir)).hasMessageStartingWith("s.json: field 'exceedance.uncertainty.samples'")
                .hasMessageContaining("whole number");
        assertThatThrownBy(() -> SessionFiles.parse(base.formatted("{\"uncertainty\": {\"srv_relative\": 3}}"),
                "s.json", dir)).hasMessageContaining("s.json: field 'exceedance.uncertainty.srv_relative'")
                .hasMessageContaining("relative");
        assertThatThrownBy(() -> SessionFiles.parse(base.formatted("{\"uncertainty\": {\"doping\": 0.1}}"),
                "s.json", dir)).hasMessageContaining("exceedance.uncertainty.doping").hasMessageContaining("unknown key");
        assertThatThrownBy(() -> SessionFiles.parse(base.formatted("{\"samples\": 100}"), "s.json", dir))
                .hasMessageContaining("exceedance.samples is not a known key");
    }

    @Test
    void physicsSettingsFileGivesTheUncertainties() throws Exception {
        Path file = dir.resolve("physics.json");
        java.nio.file.Files.writeString(file, "{\"thermal_velocity\": \"green\", \"uncertainty\":"
                + " {\"srv_relative\": 0.2, \"samples\": 3000, \"seed\": 9}}");
        ViewerModel m = opened();
        m.setAnalysis(m.analysis().withExceedance(SMALL), "exceedance settings");
        m.loadPhysics(file, true);
        ExceedanceSettings s = m.analysis().exceedance();
        assertThat(s.uncertainty().srvRelative()).isEqualTo(0.2);
        assertThat(s.uncertainty().dopingRelative()).isEqualTo(ConditionUncertainty.DEFAULTS.dopingRelative());
        assertThat(s.samples()).isEqualTo(3000);
        assertThat(s.seed()).isEqualTo(9);
        assertThat(s.thresholdPerCm3()).isEqualTo(SMALL.thresholdPerCm3());
        assertThat(m.physicsOverride()).isNotNull();
        m.undo();
        assertThat(m.analysis().exceedance()).isEqualTo(SMALL);
        java.nio.file.Files.writeString(file, "{\"uncertainty\": {\"temperature_k\": 99}}");
        assertThatThrownBy(() -> m.loadPhysics(file, true)).hasMessageContaining("uncertainty.temperature_k")
                .hasMessageContaining("K");
        assertThat(m.analysis().exceedance()).isEqualTo(SMALL);
    }

    @Test
    void rulesFlagWithConfidenceIsTheBatchVerdictOnEveryLayer() throws Exception {
        String text = """
                {"defect": "fe-i",
                 "flag": {"quantity": "trap-density", "threshold": 2e11, "min_area_mm2": 2, "confidence": 0.9},
                 "limits": {"flagged_area_fraction": {"max": 0.05}},
                 "physics": {"uncertainty": {"samples": 2000, "seed": 3}}}""";
        Path rules = dir.resolve("rules.json");
        java.nio.file.Files.writeString(rules, text);
        trapmap.maps.batch.Rules parsed = trapmap.maps.batch.Rules.parse(text, "r");
        trapmap.maps.batch.WaferResult batch = new trapmap.maps.batch.WaferInspection(parsed)
                .inspect(ViewerModelTest.W03);
        ViewerModel m = opened();
        m.loadRules(rules);
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.EXCEEDANCE_PROBABILITY), "quantity");
        WaferAnalysis r = m.compute(0, () -> false);
        assertThat(r.verdict().rulesVerdict()).isTrue();
        assertThat(r.flaggedFraction()).isEqualTo(batch.figures().get("flagged_area_fraction"));
        assertThat(r.flaggedFraction()).isPositive();
        // the layer is the flag's: its N*, the rules' samples and seed
        assertThat(r.exceedance().settings().thresholdPerCm3()).isEqualTo(2e11);
        assertThat(r.exceedance().settings().samples()).isEqualTo(2000);
        // whatever the user's own N* (the default 3e11 cm⁻³), the legend names the flag's
        assertThat(ExceedanceLayer.legend(r.exceedanceSettings())).isEqualTo("P(N_t > 2e11 cm⁻³)");
        assertThat(r.flagThreshold()).isEqualTo(0.9);
        float[] p = r.displayed().raster().samples();
        float[] tau = r.lifetime().raster().samples();
        double limit = r.exceedance().confidentLifetimeUs(0.9);
        int w = r.lifetime().width();
        int atLeast = 0;
        for (int i = 0; i < p.length; i++) {
            boolean confident = p[i] >= 0.9;
            // P >= c exactly below the lifetime limit
            if (tau[i] >= 0.001) {
                assertThat(confident).as("pixel %d", i).isEqualTo(tau[i] < limit);
            }
            if (r.flagged().get(i)) {
                assertThat(confident).as("flagged pixel %d, %d", i % w, i / w).isTrue();
            }
            atLeast += confident && r.mask().contains(i % w, i / w) ? 1 : 0;
        }
        assertThat(r.flagged().cardinality()).isPositive().isLessThanOrEqualTo(atLeast);
        // on the lifetime the flag is its lifetime limit; on the nominal density it has none
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.LIFETIME), "quantity");
        assertThat(m.compute(0, () -> false).flagThreshold()).isEqualTo(limit);
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.TRAP_DENSITY), "quantity");
        WaferAnalysis density = m.compute(0, () -> false);
        assertThat(density.flagThreshold()).isNaN();
        assertThat(density.flagged()).isEqualTo(r.flagged());
    }

    @Test
    void formChecksEachFieldWithItsUnit() {
        ExceedanceForm f = ExceedanceForm.of(ExceedanceSettings.DEFAULT);
        assertThat(f.text(ExceedanceForm.Field.SRV)).isEqualTo("50");
        assertThat(f.text(ExceedanceForm.Field.TEMPERATURE)).isEqualTo("1");
        assertThat(f.check().settings()).isEqualTo(ExceedanceSettings.DEFAULT);
        f.set(ExceedanceForm.Field.DOPING, "12.5").set(ExceedanceForm.Field.SAMPLES, "2000");
        ExceedanceSettings s = f.check().settings();
        assertThat(s.uncertainty().dopingRelative()).isEqualTo(0.125);
        assertThat(s.samples()).isEqualTo(2000);
        f.set(ExceedanceForm.Field.THRESHOLD, "0").set(ExceedanceForm.Field.LIFETIME, "x")
                .set(ExceedanceForm.Field.TEMPERATURE, "80").set(ExceedanceForm.Field.SAMPLES, "8");
        ExceedanceForm.Outcome o = f.check();
        assertThat(o.settings()).isNull();
        assertThat(o.errors()).containsOnlyKeys(ExceedanceForm.Field.THRESHOLD, ExceedanceForm.Field.LIFETIME,
                ExceedanceForm.Field.TEMPERATURE, ExceedanceForm.Field.SAMPLES);
        assertThat(o.error(ExceedanceForm.Field.THRESHOLD)).startsWith("threshold N* (cm⁻³): '0'");
        assertThat(o.error(ExceedanceForm.Field.LIFETIME)).isEqualTo("lifetime noise (%): 'x' is not a number");
        assertThat(o.error(ExceedanceForm.Field.TEMPERATURE)).contains("(K)").contains("from 0 to 50 K");
        assertThat(o.error(ExceedanceForm.Field.SAMPLES)).contains("from 16 to 4194304");
    }
}
