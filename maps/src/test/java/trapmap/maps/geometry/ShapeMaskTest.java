package trapmap.maps.geometry;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/** {@link WaferShape#mask}, with its inner-circle shortcut, against the exact distance test at every pixel. */
class ShapeMaskTest {

    @Test
    void aShapeMaskHoldsThePixelsFarEnoughInsideTheOutline() {
        PixelGrid grid = new PixelGrid(601, 577, 0.35, 295.3, 290.8);
        List<WaferShape> shapes = List.of(WaferFormat.ROUND_150_FLAT.shape().movedTo(1.1, -0.6),
                WaferFormat.ROUND_200_NOTCH.shape().movedTo(-3, 2), WaferFormat.M10.shape(),
                WaferFormat.G12.shape(33).movedTo(0.4, 0.2), RoundWafer.disk(190));
        for (WaferShape shape : shapes) {
            for (double exclusion : new double[] {0, 0.25, 3, 60}) {
                Mask m = shape.mask(grid, exclusion);
                WaferShape.Prepared p = shape.prepared();
                int w = grid.width();
                int count = 0;
                int firstWrong = -1;
                for (int i = 0; i < w * grid.height(); i++) {
                    boolean expected = p.distanceToEdgeMm(grid.xMm(i % w), grid.yMm(i / w)) >= exclusion;
                    if (m.containsIndex(i) != expected && firstWrong < 0) {
                        firstWrong = i;
                    }
                    count += expected ? 1 : 0;
                }
                assertThat(firstWrong).as("%s, %s mm: first wrong pixel", shape.describe(), exclusion).isEqualTo(-1);
                assertThat(m.count()).isEqualTo(count);
            }
        }
    }
}
