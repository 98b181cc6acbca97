package trapmap.maps.region;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.maps.geometry.RoundWafer;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.error.InvalidValueException;

class ThresholdRegionsTest {

    private static FloatRaster background(int w, int h, float value) {
        return FloatRaster.filled(w, h, value);
    }

    private static void set(FloatRaster r, int x, int y, float v) {
        r.samples()[y * r.width() + x] = v;
    }

    @Test
    void aDiskHasItsAreaCentroidBoundsPeakAndMean() {
        int n = 81;
        PixelGrid grid = PixelGrid.centred(n, n, 0.5);
        FloatRaster r = background(n, n, 1);
        int cx = 30;
        int cy = 50;
        int count = 0;
        double sum = 0;
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                if (Math.hypot(x - cx, y - cy) <= 10) {
                    float v = 5 + (float) (x - cx) * 0.01f + (float) (y - cy) * 0.001f;
                    set(r, x, y, v);
                    count++;
                    sum += v;
                }
            }
        }
        set(r, 33, 47, 9); // the peak
        sum += 9 - (5 + 3 * 0.01f + -3 * 0.001f);
        RegionTable t = ThresholdRegions.find(r, grid, null, RegionCriteria.above(2, 0), RoundWafer.disk(40));

        assertThat(t.size()).isEqualTo(1);
        Region d = t.regions().get(0);
        assertThat(d.pixelCount()).isEqualTo(count);
        assertThat(d.areaMm2()).isCloseTo(count * 0.25, within(1e-9));
        assertThat(d.areaMm2()).isCloseTo(Math.PI * 5 * 5, within(0.05 * Math.PI * 25)); // a digitised 5 mm disk
        assertThat(d.centroidXMm()).isCloseTo(grid.xMm(cx), within(1e-9));
        assertThat(d.centroidYMm()).isCloseTo(grid.yMm(cy), within(1e-9));
        assertThat(d.bounds().minXMm()).isCloseTo(grid.xMm(cx - 10.5), within(1e-9));
        assertThat(d.bounds().maxXMm()).isCloseTo(grid.xMm(cx + 10.5), within(1e-9));
        assertThat(d.bounds().minYMm()).isCloseTo(grid.yMm(cy + 10.5), within(1e-9));
        assertThat(d.bounds().heightMm()).isCloseTo(21 * 0.5, within(1e-9));
        assertThat(d.peakValue()).isEqualTo(9);
        assertThat(d.peakXMm()).isCloseTo(grid.xMm(33), within(1e-12));
        assertThat(d.peakYMm()).isCloseTo(grid.yMm(47), within(1e-12));
        assertThat(d.meanValue()).isCloseTo(sum / count, within(1e-5));
        assertThat(d.equivalentDiameterMm()).isCloseTo(10, within(0.3));
        assertThat(d.centroidInside()).isTrue();
        assertThat(d.positionXMm()).isEqualTo(d.centroidXMm());
        assertThat(d.positionYMm()).isEqualTo(d.centroidYMm());
    }

    @Test
    void aRingIsMarkedAndReportedAtItsPixelNearestTheCentroid() {
        int n = 101;
        PixelGrid grid = PixelGrid.centred(n, n, 1);
        FloatRaster r = background(n, n, 0);
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                double rad = Math.hypot(grid.xMm(x) - 10, grid.yMm(y) + 5);
                if (rad >= 20 && rad <= 23) {
                    set(r, x, y, 1 + (float) (x * 1e-3));
                }
            }
        }
        RegionTable t = ThresholdRegions.find(r, grid, null, RegionCriteria.above(0.5, 0), null);
        assertThat(t.size()).isEqualTo(1);
        Region ring = t.regions().get(0);
        assertThat(ring.centroidXMm()).isCloseTo(10, within(0.05));
        assertThat(ring.centroidYMm()).isCloseTo(-5, within(0.05));
        assertThat(ring.centroidInside()).isFalse();
        double rad = Math.hypot(ring.positionXMm() - 10, ring.positionYMm() + 5);
        assertThat(rad).isBetween(20.0, 21.0); // on the ring's inner rim, the part nearest the centroid
        int px = (int) Math.round(grid.xPx(ring.positionXMm()));
        int py = (int) Math.round(grid.yPx(ring.positionYMm()));
        assertThat(r.samples()[py * n + px]).isGreaterThan(0.5f); // a pixel of the ring
        assertThat(ring.bounds().minXMm()).isCloseTo(10 - 23.5, within(0.6));
        assertThat(ring.bounds().maxXMm()).isCloseTo(10 + 23.5, within(0.6));
        assertThat(ring.bounds().minYMm()).isCloseTo(-5 - 23.5, within(0.6));
        assertThat(ring.peakXMm()).isGreaterThan(30); // the rightmost pixels carry the largest values
    }

    @Test
    void anLShapeIsOneRegionWithItsExactCentroid() {
        FloatRaster r = background(20, 20, 0);
        long sx = 0;
        long sy = 0;
        int count = 0;
        for (int y = 2; y <= 12; y++) { // vertical bar, 11 × 3
            for (int x = 3; x <= 5; x++) {
                set(r, x, y, 1);
                sx += x;
                sy += y;
                count++;
            }
        }
        for (int y = 10; y <= 12; y++) { // foot, 3 × 8 more to the right
            for (int x = 6; x <= 13; x++) {
                set(r, x, y, 1);
                sx += x;
                sy += y;
                count++;
            }
        }
        PixelGrid grid = PixelGrid.centred(20, 20, 2);
        RegionTable t = ThresholdRegions.find(r, grid, null, RegionCriteria.above(0.5, 0), null);
        assertThat(t.size()).isEqualTo(1);
        Region l = t.regions().get(0);
        assertThat(l.pixelCount()).isEqualTo(33 + 24);
        assertThat(l.areaMm2()).isCloseTo(57 * 4, within(1e-9));
        assertThat(l.centroidXMm()).isCloseTo(grid.xMm((double) sx / count), within(1e-12));
        assertThat(l.centroidYMm()).isCloseTo(grid.yMm((double) sy / count), within(1e-12));
        assertThat(l.bounds().widthMm()).isCloseTo(11 * 2, within(1e-12));
        assertThat(l.bounds().heightMm()).isCloseTo(11 * 2, within(1e-12));
    }

    @Test
    void diagonalNeighboursJoinButAGapSeparates() {
        FloatRaster r = background(10, 10, 0);
        set(r, 1, 1, 1);
        set(r, 2, 2, 1);
        set(r, 3, 3, 1); // a diagonal chain: one region under 8-connectivity
        set(r, 5, 3, 1); // one pixel of background between (3,3) and (5,3): separate
        set(r, 8, 8, 1);
        set(r, 9, 7, 1); // anti-diagonal pair
        RegionTable t = ThresholdRegions.find(r, PixelGrid.centred(10, 10, 1), null, RegionCriteria.above(0, 0),
                null);
        assertThat(t.regions()).extracting(Region::pixelCount).containsExactly(3, 1, 2);
        assertThat(t.regions()).extracting(Region::id).containsExactly(1, 2, 3);
    }

    @Test
    void minimumAreaDropsSmallRegionsAndRenumbers() {
        FloatRaster r = background(30, 10, 0);
        set(r, 1, 1, 1); // 1 px
        for (int x = 10; x < 14; x++) {
            set(r, x, 5, 1); // 4 px
        }
        for (int x = 20; x < 29; x++) {
            set(r, x, 2, 1); // 9 px
        }
        PixelGrid grid = PixelGrid.centred(30, 10, 0.5); // 0.25 mm² per pixel
        RegionTable t = ThresholdRegions.find(r, grid, null, RegionCriteria.above(0, 1.0), null);
        // ids follow the scan from the top row: the 9-pixel bar (row 2) before the 4-pixel one (row 5)
        assertThat(t.regions()).extracting(Region::pixelCount).containsExactly(9, 4);
        assertThat(t.regions()).extracting(Region::id).containsExactly(1, 2);
        assertThat(t.byArea()).extracting(Region::pixelCount).containsExactly(9, 4);
        assertThat(ThresholdRegions.find(r, grid, null, RegionCriteria.above(0, 0), null).size()).isEqualTo(3);
        assertThat(t.totalAreaMm2()).isCloseTo(13 * 0.25, within(1e-12));
    }

    @Test
    void belowThresholdRegionsPeakAtTheirMinimumAndSortByIt() {
        FloatRaster r = background(20, 5, 100);
        set(r, 2, 2, 8);
        set(r, 3, 2, 3); // deepest of region 1
        set(r, 10, 2, 1); // region 2: one very low pixel
        set(r, 15, 1, 9);
        set(r, 15, 2, 9);
        set(r, 15, 3, 9); // region 3: largest, shallow
        set(r, 18, 4, Float.NaN); // no data never qualifies
        RegionTable t = ThresholdRegions.find(r, PixelGrid.centred(20, 5, 1), null, RegionCriteria.below(10, 0),
                null);
        // scan order: the shallow bar starts on row 1, the other two on row 2
        assertThat(t.regions()).extracting(Region::peakValue).containsExactly(9.0, 3.0, 1.0);
        assertThat(t.byPeak()).extracting(Region::peakValue).containsExactly(1.0, 3.0, 9.0);
        assertThat(t.byArea()).extracting(Region::pixelCount).containsExactly(3, 2, 1);
    }

    @Test
    void theMaskLimitsTheRegions() {
        FloatRaster r = background(10, 10, 5);
        Mask leftHalf = Mask.of(10, 10, i -> i % 10 < 5);
        RegionTable t = ThresholdRegions.find(r, PixelGrid.centred(10, 10, 1), leftHalf,
                RegionCriteria.above(1, 0), null);
        assertThat(t.size()).isEqualTo(1);
        assertThat(t.regions().get(0).pixelCount()).isEqualTo(50);
    }

    @Test
    void aWholeSixteenMegapixelMapIsOneRegionWithoutStackOverflow() {
        int n = 4000;
        FloatRaster r = background(n, n, 2);
        PixelGrid grid = PixelGrid.centred(n, n, 0.05);
        RegionTable t = ThresholdRegions.find(r, grid, null, RegionCriteria.above(1, 0), null);
        assertThat(t.size()).isEqualTo(1);
        Region all = t.regions().get(0);
        assertThat(all.pixelCount()).isEqualTo(n * n);
        assertThat(all.centroidXMm()).isCloseTo(0, within(1e-9));
        assertThat(all.centroidYMm()).isCloseTo(0, within(1e-9));
        assertThat(all.areaMm2()).isCloseTo(200 * 200, within(1e-6));
        // the map frame is its data outline: the border pixel centres lie half a pixel inside it
        assertThat(all.edgeDistanceMm()).isCloseTo(0.5 * 0.05, within(1e-6));
    }

    @Test
    void edgeDistanceToAGivenWaferShape() {
        int n = 201;
        PixelGrid grid = PixelGrid.centred(n, n, 0.5);
        RoundWafer wafer = RoundWafer.disk(90);
        FloatRaster r = background(n, n, 1);
        // a 5 × 5 px spot centred 30 mm right of the centre: its outermost pixel centres are at x = 31 mm
        for (int y = 98; y <= 102; y++) {
            for (int x = 158; x <= 162; x++) {
                set(r, x, y, 10);
            }
        }
        Region spot = ThresholdRegions.find(r, grid, null, RegionCriteria.above(5, 0), wafer).regions().get(0);
        double expected = Double.POSITIVE_INFINITY;
        for (int y = 98; y <= 102; y++) {
            for (int x = 158; x <= 162; x++) {
                expected = Math.min(expected, 45 - Math.hypot(grid.xMm(x), grid.yMm(y)));
            }
        }
        assertThat(spot.edgeDistanceMm()).isCloseTo(expected, within(1e-9));
        assertThat(spot.edgeDistanceMm()).isCloseTo(45 - Math.hypot(31, 1), within(1e-9));
        assertThat(spot.reachesEdge(5)).isFalse();
    }

    @Test
    void edgeDistanceToTheOutlineOfTheData() {
        int n = 201;
        PixelGrid grid = PixelGrid.centred(n, n, 0.5);
        RoundWafer wafer = RoundWafer.disk(90);
        FloatRaster r = background(n, n, 1);
        float[] s = r.samples();
        for (int i = 0; i < s.length; i++) {
            if (!wafer.contains(grid.xMm(i % n), grid.yMm(i / n))) {
                s[i] = Float.NaN;
            }
        }
        int lastValid = 100 + 90; // x = 45 mm: the last pixel centre inside the disk on the middle row
        for (int x = lastValid - 14; x <= lastValid - 10; x++) {
            set(r, x, 100, 10); // a spot well inside
        }
        set(r, lastValid, 100, 10); // a pixel on the rim
        RegionTable t = ThresholdRegions.find(r, grid, null, RegionCriteria.above(5, 0), null);
        assertThat(t.edgeReference()).isEqualTo(RegionTable.EdgeReference.DATA_OUTLINE);
        Region inner = t.regions().get(0);
        Region rim = t.regions().get(1);
        assertThat(rim.pixelCount()).isEqualTo(1);
        // one pixel to the first NaN pixel, of which half lies inside the data
        assertThat(rim.edgeDistanceMm()).isCloseTo(0.5 * 0.5, within(1e-6));
        assertThat(rim.reachesEdge(0.25)).isTrue();
        // brute force: nearest NaN pixel centre to any spot pixel centre, less half a pixel
        double nearestPx = Double.POSITIVE_INFINITY;
        for (int i = 0; i < s.length; i++) {
            if (Float.isNaN(s[i])) {
                for (int x = lastValid - 14; x <= lastValid - 10; x++) {
                    nearestPx = Math.min(nearestPx, Math.hypot(i % n - x, i / n - 100));
                }
            }
        }
        assertThat(inner.edgeDistanceMm()).isCloseTo((nearestPx - 0.5) * 0.5, within(1e-5));
        assertThat(inner.edgeDistanceMm()).isBetween(4.5, 5.25);
    }

    @Test
    void badArgumentsAreRefusedWithFieldAndUnit() {
        assertThatThrownBy(() -> RegionCriteria.above(1, -2)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("minArea").hasMessageContaining("mm²");
        FloatRaster r = background(4, 3, 0);
        assertThatThrownBy(() -> ThresholdRegions.find(r, PixelGrid.centred(3, 4, 1), null,
                RegionCriteria.above(0, 0), null)).isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("grid 3x4");
        assertThat(ThresholdRegions.find(r, PixelGrid.centred(4, 3, 1), null, RegionCriteria.above(0, 0), null)
                .regions()).isEqualTo(List.of());
    }
}
