package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.physics.defect.DefectLibrary;

/**
 * The public {@link WaferInspection#judge(String, WaferMap, trapmap.physics.defect.Defect)} that the viewer and
 * the wafer report use judges exactly as {@link WaferInspection#inspect} does, and states an overridden defect.
 */
class WaferInspectionEvaluateTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    private static WaferInspection inspection() throws Exception {
        return new WaferInspection(Rules.read(DEMO.resolve("rules-example.json")));
    }

    @Test
    void evaluateGivesInspectsResultWithTheMapsItJudged() throws Exception {
        WaferInspection in = inspection();
        for (String file : new String[] {"LOT-A01-W01.tif", "LOT-N01-W02.tif", "LOT-A03-W02-feb-state.tif"}) {
            WaferResult expected = in.inspect(DEMO.resolve(file));
            WaferInspection.Evaluation e = in.judge(file, MapFiles.readSingle(DEMO.resolve(file)), null);
            WaferResult r = e.result();
            assertThat(r.status()).as(file).isEqualTo(expected.status());
            assertThat(r.grade()).isEqualTo(expected.grade());
            assertThat(r.profile()).isEqualTo(expected.profile()).isEqualTo(e.profile().name());
            assertThat(r.defectId()).isEqualTo(expected.defectId()).isEqualTo(e.defect().id());
            assertThat(r.figures()).isEqualTo(expected.figures());
            assertThat(r.failed()).isEqualTo(expected.failed());
            assertThat(r.gradedDownBy()).isEqualTo(expected.gradedDownBy());
            assertThat(e.defectOverridden()).isFalse();
            assertThat(e.lifetime().quantity()).isEqualTo(Quantity.EFFECTIVE_LIFETIME);
            assertThat(e.density().quantity()).isEqualTo(Quantity.TRAP_DENSITY);
            int evaluated = 0;
            for (boolean b : e.evaluated()) {
                evaluated += b ? 1 : 0;
            }
            assertThat(evaluated).isPositive();
            assertThat(e.regions().regions()).hasSameSizeAs(expected.regions());
        }
    }

    @Test
    void anOverriddenDefectConvertsAndJudgesWithIt() throws Exception {
        WaferInspection in = inspection();
        WaferMap map = MapFiles.readSingle(DEMO.resolve("LOT-A01-W01.tif"));
        WaferInspection.Evaluation own = in.judge("LOT-A01-W01.tif", map, null);
        WaferInspection.Evaluation cr = in.judge("LOT-A01-W01.tif", map, DefectLibrary.byId("cr-i"));
        assertThat(cr.defectOverridden()).isTrue();
        assertThat(cr.result().defectId()).isEqualTo("cr-i");
        assertThat(cr.profile().name()).isEqualTo("default");
        assertThat(cr.result().figures().get("trap_density_p95_cm3"))
                .isNotEqualTo(own.result().figures().get("trap_density_p95_cm3"));
        assertThat(cr.result().figures().get("harmonic_mean_lifetime_us"))
                .isEqualTo(own.result().figures().get("harmonic_mean_lifetime_us"));
        // the override's densities are the same conversion the batch makes for a profile naming that defect
        float[] expected = WaferInspection.trapDensity(cr.lifetime(), DefectLibrary.byId("cr-i")).raster().samples();
        float[] got = cr.density().raster().samples();
        for (int i = 0; i < got.length; i++) {
            if (cr.evaluated()[i]) {
                assertThat(got[i]).as("pixel %d", i).isEqualTo(expected[i]);
            }
        }
    }

    @Test
    void aMapThatCannotBeJudgedThrowsWithItsReason() throws Exception {
        WaferInspection in = inspection();
        WaferMap lifetime = MapFiles.readSingle(DEMO.resolve("LOT-A01-W01.tif"));
        WaferMap density = in.judge("w.tif", lifetime, null).density();
        assertThatThrownBy(() -> in.judge("w.tif", density, null)).isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("cannot be inspected");
    }
}
