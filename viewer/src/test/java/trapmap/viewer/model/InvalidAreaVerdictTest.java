package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferInspection;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * The viewer shows the batch's invalid_area_fraction: the quick threshold check reports it and warns above the
 * default limit without failing; a rules verdict carries the batch's figure and failed-rule text.
 */
class InvalidAreaVerdictTest {
    private static final int N = 101;
    private static final PixelGrid GRID = PixelGrid.centred(N, N, 1.0);

    /** 100 µs on a 100 mm wafer with the first 34 % of the pixels within 45 mm of the centre at 0 µs. */
    private static WaferMap map() {
        float[] s = new float[N * N];
        Mask inner = WaferFormat.byId("round-100-flat").shape().mask(GRID, 5);
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                s[y * N + x] = Math.hypot(GRID.xMm(x), GRID.yMm(y)) > 50 ? Float.NaN : 100f;
            }
        }
        int zeros = (int) (0.34 * inner.count());
        for (int i = inner.nextIndex(0), k = 0; k < zeros; i = inner.nextIndex(i + 1), k++) {
            s[i] = 0f;
        }
        return new WaferMap(FloatRaster.wrap(N, N, s), GRID, Quantity.EFFECTIVE_LIFETIME, "zeros",
                MeasurementConditions.UNKNOWN.withDoping(Doping.pType(1e16)).withInjection(1e15),
                Provenance.of("test"));
    }

    @Test
    void theQuickCheckShowsTheInvalidAreaAndWarnsAboveTheDefaultLimit() {
        Analysis a = Analysis.DEFAULT.withEdgeExclusion(5);
        // the zeros are flagged (below 1 µs) but the check lets the wafer pass on its own rule up to 50 %
        a = a.withThreshold(a.threshold().withValue(1).withMaxFraction(0.5));
        WaferAnalysis r = WaferAnalyzer.analyse(map(), a, DefectLibrary.byId("fe-i"), null, null);
        Verdict v = r.verdict();
        assertThat(v.pass()).isTrue();
        assertThat(v.invalid()).isNotNull();
        // counted here: the zeros inside the fitted outline less 5 mm; every other pixel there holds 100 µs
        Mask area = r.shape().mask(GRID, 5);
        float[] s = map().raster().samples();
        int zeros = 0;
        for (int i = area.nextIndex(0); i >= 0; i = area.nextIndex(i + 1)) {
            zeros += s[i] == 0 ? 1 : 0;
        }
        assertThat(v.invalid().evaluatedCount()).isEqualTo(area.count());
        assertThat(v.invalid().nonPositiveCount()).isEqualTo(zeros);
        assertThat(v.invalid().nonFiniteCount() + v.invalid().invalidConversionCount()).isZero();
        assertThat(v.figures().get("invalid_area_fraction")).isEqualTo(v.invalid().fraction());
        assertThat(v.invalid().fraction()).isEqualTo((double) zeros / area.count()).isBetween(0.30, 0.38);
        assertThat(v.invalidAreaWarning()).matches("invalid_area_fraction 0\\.3\\d* > 0\\.05 \\(default limit\\)");
        assertThat(v.headlineWithWarning()).contains("quick threshold check: pass — warning: invalid_area_fraction");
        assertThat(v.rows()).anySatisfy(row -> assertThat(row[0]).isEqualTo("invalid area"));
        assertThat(v.rows()).anySatisfy(row -> assertThat(row[0]).isEqualTo("below detection limit"));
    }

    @Test
    void aRulesVerdictCarriesTheBatchsFigureAndDefaultLimitFailure() throws Exception {
        Rules rules = Rules.parse("{\"wafer\": \"round-100-flat\", \"edge_exclusion_mm\": 5,"
                + " \"flag\": {\"quantity\": \"lifetime\", \"threshold\": 1e-6}}", "r.json");
        LoadedRules loaded = new LoadedRules(Path.of("r.json").toAbsolutePath(), rules, new WaferInspection(rules));
        WaferAnalysis r = WaferAnalyzer.judge("zeros.tif", map(), Analysis.DEFAULT, loaded, null, null, null, null);
        Verdict v = r.verdict();
        double batch = new WaferInspection(rules).evaluate("zeros.tif", map(), null).figures()
                .get("invalid_area_fraction");
        assertThat(v.figures().get("invalid_area_fraction")).isEqualTo(batch);
        assertThat(v.invalid().fraction()).isEqualTo(batch);
        assertThat(v.pass()).isFalse();
        assertThat(v.failedRules()).singleElement().asString().endsWith("> 0.05 (default limit)");
        // a rules verdict states the failure in its failed rules, not as a quick-check warning
        assertThat(v.invalidAreaWarning()).isEmpty();
    }
}
