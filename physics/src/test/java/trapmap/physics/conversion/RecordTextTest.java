package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;

import java.lang.reflect.RecordComponent;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.recombination.SurfaceModel;

/**
 * Records whose {@code toString} is written out (it goes into the history of converted maps) give the text of the
 * generated one, {@code Name[component=value, ...]}, built here from the record's components by reflection, so that
 * a component added later cannot be left out of the text.
 */
class RecordTextTest {
    /** The generated record text: simple name, then every component as {@code name=String.valueOf(value)}. */
    static String generated(Record r) throws ReflectiveOperationException {
        List<String> parts = new ArrayList<>();
        for (RecordComponent c : r.getClass().getRecordComponents()) {
            parts.add(c.getName() + "=" + c.getAccessor().invoke(r));
        }
        return r.getClass().getSimpleName() + "[" + String.join(", ", parts) + "]";
    }

    @Test
    void surfaceInjectionTextsAreTheGeneratedOnes() throws ReflectiveOperationException {
        for (Record r : new Record[] {Surface.sproul(180, 10), Surface.IDEAL, new Surface(725.5, 1e5,
                SurfaceModel.values()[SurfaceModel.values().length - 1]), new Injection.Generation(1e19),
                new Injection.Generation(2.5e17), new Injection.Fixed(1e15), new Injection.Fixed(3.3e13)}) {
            assertThat(r.toString()).isEqualTo(generated(r));
        }
        assertThat(Surface.sproul(180, 10).toString()).isEqualTo("Surface[thicknessUm=180.0, srvCmPerS=10.0,"
                + " model=SPROUL]");
    }

    @Test
    void aBuiltInDefectSuitsItsTypesAlsoAsAnEqualCopy() {
        Defect d = DefectLibrary.byId("fe-i");
        Defect copy = new Defect(d.id(), d.name(), d.level(), d.electronCrossSectionCm2(), d.holeCrossSectionCm2(),
                d.captureRatio(), d.velocityConvention(), d.source(), d.spread());
        Defect changed = new Defect(d.id(), d.name(), d.level(), d.electronCrossSectionCm2() * 2,
                d.holeCrossSectionCm2() * 2, d.captureRatio(), d.velocityConvention(), d.source(), d.spread());
        assertThat(DefectLibrary.suitability(copy)).isEqualTo(DefectLibrary.suitability(d));
        assertThat(DefectLibrary.suitedTypes(d)).hasSize(1);
        assertThat(DefectLibrary.suitedTypes(changed)).hasSize(2);
    }
}
