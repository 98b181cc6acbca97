package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.maps.geometry.OutlineDetection;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.region.RegionCriteria;

/**
 * The labelling split into small methods gives exactly the regions, figures and pixels of the single-method labelling
 * it replaced ({@link FlaggedRegionsReference}): on demonstration wafers, with and without trap densities, edge
 * distances over all pixels and over the border pixels only, and on random maps whose regions touch the raster's
 * border, include NaN densities, equal values (peak ties) and regions below the minimum area.
 */
class FlaggedRegionsSplitTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    private static void assertSame(FlaggedRegions actual, FlaggedRegions expected) {
        assertThat(actual.regions()).isEqualTo(expected.regions());
        assertThat(actual.pixels()).isEqualTo(expected.pixels());
    }

    @ParameterizedTest
    @ValueSource(strings = {"LOT-A01-W02.tif", "LOT-A01-W07.tif", "LOT-N01-W02.tif", "MON-200-W01.tif"})
    void demonstrationWafersGiveTheSameRegions(String file) throws Exception {
        WaferMap m = MapFiles.readSingle(DEMO.resolve(file));
        WaferShape shape = OutlineDetection.fit(m).shape();
        Masks masks = Masks.of(m.raster().samples(), m.grid(), shape, 2, Double.NaN);
        float[] s = m.raster().samples();
        float[] values = new float[masks.count()];
        for (int k = 0; k < values.length; k++) {
            values[k] = s[masks.indices()[k]];
        }
        Arrays.sort(values);
        float[] density = new float[s.length];
        for (int i = 0; i < s.length; i++) {
            density[i] = i % 13 == 0 ? Float.NaN : 1e12f / s[i];
        }
        int regions = 0;
        for (RegionCriteria c : List.of(RegionCriteria.below(values[values.length / 20], 0),
                RegionCriteria.below(values[values.length / 5], 1),
                RegionCriteria.above(values[values.length - 1 - values.length / 20], 0.5))) {
            for (float[] d : new float[][] {null, density}) {
                for (double inside : new double[] {Double.NEGATIVE_INFINITY, 2}) {
                    FlaggedRegions expected = FlaggedRegionsReference.find(m.raster(), m.grid(), masks.indices(),
                            masks.count(), c, shape, d, inside);
                    assertSame(FlaggedRegions.find(m.raster(), m.grid(), masks.indices(), masks.count(), c, shape, d,
                            inside), expected);
                    regions += expected.regions().size();
                }
            }
            // packed values, through the batch's buffers
            float[] packed = new float[masks.count()];
            float[] packedDensity = new float[masks.count()];
            for (int k = 0; k < packed.length; k++) {
                packed[k] = s[masks.indices()[k]];
                packedDensity[k] = density[masks.indices()[k]];
            }
            InspectionBuffers buffers = new InspectionBuffers();
            assertSame(FlaggedRegions.findPacked(packed, packedDensity, m.grid(), masks.indices(), masks.count(), c,
                    shape, 2, buffers), FlaggedRegionsReference.findPacked(packed, packedDensity, m.grid(),
                    masks.indices(), masks.count(), c, shape, 2, new InspectionBuffers()));
        }
        assertThat(regions).isPositive();
    }

    @Test
    void randomMapsGiveTheSameRegions() {
        Random rnd = new Random(13);
        for (int trial = 0; trial < 40; trial++) {
            int w = 1 + rnd.nextInt(70);
            int h = 1 + rnd.nextInt(70);
            float[] s = new float[w * h];
            float[] density = new float[w * h];
            for (int i = 0; i < s.length; i++) {
                // few distinct values: ties for the peak; blobs from a coarse pattern plus noise
                s[i] = rnd.nextInt(5) == 0 ? rnd.nextInt(8) : ((i % w) / 7 + (i / w) / 5) % 8;
                density[i] = rnd.nextInt(6) == 0 ? Float.NaN : rnd.nextInt(4) * 1e11f;
            }
            PixelGrid grid = PixelGrid.centred(w, h, 0.25 + rnd.nextInt(3) * 0.5);
            int[] all = new int[w * h];
            int n = 0;
            for (int i = 0; i < all.length; i++) {
                if (rnd.nextInt(10) != 0) {
                    all[n++] = i;
                }
            }
            FloatRaster raster = FloatRaster.wrap(w, h, s);
            for (RegionCriteria c : List.of(RegionCriteria.below(3, 0), RegionCriteria.below(2, 1.2),
                    RegionCriteria.above(5, 0))) {
                for (float[] d : new float[][] {null, density}) {
                    assertSame(FlaggedRegions.find(raster, grid, all, n, c, null, d),
                            FlaggedRegionsReference.find(raster, grid, all, n, c, null, d));
                }
            }
        }
    }
    @Test
    void regionsOnShapesOffTheCentreHaveTheEdgeDistancesOfEveryPixel() {
        // round (notch, flat) and square wafers off the grid's centre and turned: the edge distance of a region is
        // the least exact distance of its pixels (border pixels only, or all), found with fewer exact distances
        Random rnd = new Random(29);
        List<WaferShape> shapes = List.of(new trapmap.maps.geometry.RoundWafer(60, trapmap.maps.geometry.Fiducial
                .notch(3, 90), 200, 1.3, -0.7), new trapmap.maps.geometry.RoundWafer(56,
                trapmap.maps.geometry.Fiducial.flat(30), 30, -2, 1), new trapmap.maps.geometry.SquareWafer(50, 62, 17,
                -1.1, 0.9), trapmap.maps.geometry.SquareWafer.full(52).movedTo(0.4, 0.2));
        for (WaferShape shape : shapes) {
            for (int trial = 0; trial < 6; trial++) {
                int w = 60 + rnd.nextInt(40);
                int h = 60 + rnd.nextInt(40);
                PixelGrid grid = PixelGrid.centred(w, h, 64.0 / Math.min(w, h));
                float[] s = new float[w * h];
                float[] density = new float[w * h];
                for (int i = 0; i < s.length; i++) {
                    s[i] = rnd.nextInt(4) == 0 ? rnd.nextInt(8) : ((i % w) / 9 + (i / w) / 6) % 8;
                    density[i] = rnd.nextInt(6) == 0 ? Float.NaN : rnd.nextInt(4) * 1e11f;
                }
                double exclusion = rnd.nextInt(3);
                Masks masks = Masks.of(s, grid, shape, exclusion, Double.NaN);
                FloatRaster raster = FloatRaster.wrap(w, h, s);
                for (RegionCriteria c : List.of(RegionCriteria.below(3, 0), RegionCriteria.above(5, 0.5))) {
                    for (double inside : new double[] {Double.NEGATIVE_INFINITY, exclusion}) {
                        FlaggedRegions expected = FlaggedRegionsReference.find(raster, grid, masks.indices(),
                                masks.count(), c, shape, density, inside);
                        assertThat(expected.regions()).isNotEmpty();
                        assertSame(FlaggedRegions.find(raster, grid, masks.indices(), masks.count(), c, shape,
                                density, inside), expected);
                    }
                }
            }
        }
    }
    @Test
    void packedSelectionComparesFloatsWithTheThresholdAsDoubles() {
        // thresholds just below and just above a float (which is then the nearest float to each): compared in
        // float, that float would lie on the wrong side of one of them
        float nearest = (float) 3e11;
        double under = nearest - 1.0;
        double over = nearest + 1.0;
        int w = 40;
        int h = 30;
        float[] s = new float[w * h];
        Random rnd = new Random(7);
        for (int i = 0; i < s.length; i++) {
            float[] choices = {Math.nextDown(nearest), nearest, Math.nextUp(nearest), Float.NaN, 1e11f, 5e11f};
            s[i] = choices[rnd.nextInt(choices.length)];
        }
        PixelGrid grid = PixelGrid.centred(w, h, 0.5);
        int[] all = new int[w * h];
        for (int i = 0; i < all.length; i++) {
            all[i] = i;
        }
        for (RegionCriteria c : List.of(RegionCriteria.above(under, 0), RegionCriteria.below(under, 0),
                RegionCriteria.above(over, 0), RegionCriteria.below(over, 0), RegionCriteria.above(nearest, 0),
                RegionCriteria.below(nearest, 0))) {
            FlaggedRegions expected = FlaggedRegionsReference.findPacked(s, s, grid, all, all.length, c, null, 0,
                    new InspectionBuffers());
            assertThat(expected.regions()).isNotEmpty();
            assertSame(FlaggedRegions.findPacked(s, s, grid, all, all.length, c, null, 0, new InspectionBuffers()),
                    expected);
        }
    }
}
