package trapmap.maps.geometry;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.Random;
import org.junit.jupiter.api.Test;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/** The reduced-mask outline fit every face uses, against the full-resolution fit of the same map. */
class ReducedOutlineTest {

    private static FloatRaster render(WaferShape shape, PixelGrid grid, long seed) {
        Random rnd = new Random(seed);
        int w = grid.width();
        float[] s = new float[w * grid.height()];
        WaferShape.Prepared p = shape.prepared();
        for (int i = 0; i < s.length; i++) {
            s[i] = p.contains(grid.xMm(i % w), grid.yMm(i / w)) && rnd.nextInt(500) != 0 ? 50 + rnd.nextFloat()
                    : Float.NaN;
        }
        return FloatRaster.wrap(w, grid.height(), s);
    }

    @Test
    void theReducedFitStaysWithinItsStatedToleranceOfTheFullFit() {
        PixelGrid grid = new PixelGrid(1700, 1650, 0.12, 851.2, 822.9);
        for (WaferShape truth : new WaferShape[] {WaferFormat.ROUND_150_FLAT.shape(40).movedTo(1.2, -0.7),
                WaferFormat.M10.shape(3).movedTo(-0.5, 0.3)}) {
            FloatRaster map = render(truth, grid, 4);
            OutlineFit full = OutlineDetection.fit(Mask.valid(map), grid);
            OutlineFit reduced = ReducedOutline.fit(map, grid);
            int k = ReducedOutline.factor(grid);
            assertThat(k).isEqualTo(10);
            double coarsePitch = k * grid.pitchMm();
            assertThat(reduced.closestFormat().pitchMm()).isEqualTo(coarsePitch);
            assertThat(reduced.model()).isEqualTo(full.model());
            assertThat(reduced.closestFormat().format()).isEqualTo(full.closestFormat().format());
            assertThat(reduced.closestFormat().withinTolerance()).isTrue();
            double tolerance = reduced.closestFormat().toleranceMm();
            assertThat(reduced.shape().centreXMm()).isCloseTo(full.shape().centreXMm(), within(coarsePitch / 2));
            assertThat(reduced.shape().centreYMm()).isCloseTo(full.shape().centreYMm(), within(coarsePitch / 2));
            if (full.shape() instanceof RoundWafer f) {
                RoundWafer r = (RoundWafer) reduced.shape();
                assertThat(r.diameterMm()).isCloseTo(f.diameterMm(), within(tolerance));
                assertThat(r.fiducialAngleDeg()).isCloseTo(f.fiducialAngleDeg(), within(1.0));
            } else {
                SquareWafer f = (SquareWafer) full.shape();
                SquareWafer r = (SquareWafer) reduced.shape();
                assertThat(r.sideMm()).isCloseTo(f.sideMm(), within(tolerance));
                assertThat(r.diagonalMm()).isCloseTo(f.diagonalMm(), within(tolerance));
                assertThat(r.rotationDeg()).isCloseTo(f.rotationDeg(), within(0.1));
            }
        }
    }

    @Test
    void aSmallMapIsFittedAsItIs() {
        PixelGrid grid = PixelGrid.centred(300, 300, 0.6);
        FloatRaster map = render(RoundWafer.disk(150), grid, 1);
        assertThat(ReducedOutline.factor(grid)).isEqualTo(1);
        assertThat(ReducedOutline.fit(map, grid).shape()).isEqualTo(OutlineDetection.fit(Mask.valid(map), grid)
                .shape());
    }
}
