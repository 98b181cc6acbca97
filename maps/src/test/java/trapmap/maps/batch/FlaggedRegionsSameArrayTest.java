package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Random;
import org.junit.jupiter.api.Test;
import trapmap.maps.geometry.RoundWafer;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.region.RegionCriteria;

/**
 * A flag on the trap density passes the same packed array as flagged values and densities; the regions (with their
 * density figures) are those found from a copy of the densities in an array of its own.
 */
class FlaggedRegionsSameArrayTest {
    @Test
    void theSameArrayForFlagAndDensityGivesTheRegionsOfACopy() {
        int w = 120;
        int h = 100;
        PixelGrid grid = PixelGrid.centred(w, h, 0.5);
        Random rnd = new Random(23);
        int[] indices = new int[w * h];
        float[] values = new float[w * h];
        int count = 0;
        for (int i = 0; i < w * h; i++) {
            if (rnd.nextInt(40) == 0) {
                continue; // not evaluated
            }
            int x = i % w;
            int y = i / w;
            double blob = Math.exp(-((x - 40) * (x - 40) + (y - 30) * (y - 30)) / 60.0)
                    + Math.exp(-((x - 90) * (x - 90) + (y - 70) * (y - 70)) / 20.0);
            indices[count] = i;
            values[count++] = rnd.nextInt(50) == 0 ? Float.NaN : (float) (1e10 * (1 + 40 * blob) * (1 + 0.3
                    * rnd.nextGaussian()));
        }
        for (RegionCriteria c : new RegionCriteria[] {RegionCriteria.above(2e11, 0.5), RegionCriteria.above(5e10, 0),
            RegionCriteria.below(8e9, 0.25)}) {
            FlaggedRegions same = FlaggedRegions.findPacked(values, values, grid, indices, count, c,
                    RoundWafer.disk(28), 1, new InspectionBuffers());
            FlaggedRegions copy = FlaggedRegions.findPacked(values, values.clone(), grid, indices, count, c,
                    RoundWafer.disk(28), 1, new InspectionBuffers());
            assertThat(same.regions()).as("%s", c).isNotEmpty().isEqualTo(copy.regions());
            assertThat(same.pixels()).isEqualTo(copy.pixels());
        }
    }
}
