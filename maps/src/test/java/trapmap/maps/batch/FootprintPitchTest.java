package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayDeque;
import java.util.BitSet;
import java.util.Random;
import org.junit.jupiter.api.Test;
import trapmap.maps.raster.PixelGrid;

/**
 * {@link Footprint#of}: at a pixel pitch at or below the cell size each pixel marks the cell under its centre; coarser
 * pixels mark every cell whose centre lies in their square, so that a round flagged spot stays one contiguous set of
 * cells and one hot spot.
 */
class FootprintPitchTest {
    private static final int N = 64;

    /** A round wafer of radius {@code radiusMm} on an N × N grid, and in it a round spot of radius 6 mm. */
    private record Wafer(PixelGrid grid, int[] indices, int count, BitSet flagged) {
        static Wafer of(double pitch, double cx, double cy, double radiusMm, double spotX, double spotY) {
            PixelGrid g = new PixelGrid(N, N, pitch, cx, cy);
            int[] indices = new int[N * N];
            int count = 0;
            BitSet flagged = new BitSet();
            for (int y = 0; y < N; y++) {
                for (int x = 0; x < N; x++) {
                    double xm = g.xMm(x);
                    double ym = g.yMm(y);
                    if (Math.hypot(xm, ym) <= radiusMm) {
                        indices[count++] = y * N + x;
                        if (Math.hypot(xm - spotX, ym - spotY) <= 6) {
                            flagged.set(y * N + x);
                        }
                    }
                }
            }
            return new Wafer(g, indices, count, flagged);
        }

        Footprint footprint() {
            return Footprint.of("round-156", grid, indices, count, flagged);
        }
    }

    /** The number of 4-connected groups of set cells. */
    private static int groups(BitSet cells, int width) {
        BitSet left = (BitSet) cells.clone();
        int groups = 0;
        for (int start = left.nextSetBit(0); start >= 0; start = left.nextSetBit(0)) {
            groups++;
            ArrayDeque<Integer> todo = new ArrayDeque<>();
            todo.add(start);
            left.clear(start);
            while (!todo.isEmpty()) {
                int c = todo.poll();
                int i = c % width;
                for (int n : new int[] {c - width, c + width, i > 0 ? c - 1 : -1, i < width - 1 ? c + 1 : -1}) {
                    if (n >= 0 && left.get(n)) {
                        left.clear(n);
                        todo.add(n);
                    }
                }
            }
        }
        return groups;
    }

    @Test
    void aRoundSpotOnCoarsePixelsIsOneContiguousFootprintAndOneHotSpot() {
        for (double pitch : new double[] {2.6, 1.7, 4.2}) {
            Wafer w = Wafer.of(pitch, 31.5, 31.5, 0.48 * N * pitch, 20, -15);
            Footprint f = w.footprint();
            assertThat(groups(f.flagged(), f.width())).as("groups of flagged cells at %s mm", pitch).isEqualTo(1);
            // the spot's area in cells: the flagged pixels' area, within the cells along its rim
            double area = w.flagged().cardinality() * pitch * pitch;
            assertThat((double) f.flagged().cardinality()).as("flagged cells at %s mm", pitch)
                    .isCloseTo(area, org.assertj.core.data.Offset.offset(2 * Math.PI * 6 * pitch / 2));
            // the wafer's evaluated cells have no holes: every cell within the wafer, less one pixel, is covered
            double inner = 0.48 * N * pitch - pitch;
            for (int j = 0; j < f.height(); j++) {
                for (int i = 0; i < f.width(); i++) {
                    if (Math.hypot(f.minI() + i, f.minJ() + j) <= inner) {
                        assertThat(f.covered().get(j * f.width() + i)).as("cell %d, %d at %s mm", f.minI() + i,
                                f.minJ() + j, pitch).isTrue();
                    }
                }
            }
            // every flagged cell is an evaluated one
            BitSet outside = (BitSet) f.flagged().clone();
            outside.andNot(f.covered());
            assertThat(outside.isEmpty()).isTrue();
        }
        // six wafers of 2.6 mm pixels, spot centre shifted a little between them: one hot spot
        RecurrenceMap six = new RecurrenceMap();
        Random rnd = new Random(7);
        for (int k = 0; k < 6; k++) {
            six.add(Wafer.of(2.6, 31.5 + rnd.nextDouble() - 0.5, 31.5 + rnd.nextDouble() - 0.5, 80, 45, -30)
                    .footprint());
        }
        HotSpots.Result hot = HotSpots.find(six.families().get("round-156"), HotSpots.Criteria.DEFAULT);
        assertThat(hot.regions().size()).isEqualTo(1);
        assertThat(hot.cells().cardinality()).as("about the spot's 113 mm²").isBetween(90, 140);
    }

    @Test
    void coarsePixelsOfAWaferBeyondTheRecurrenceMapsReachKeepOneCellEach() {
        // the wafer centre 2000 mm off the map: left out of the recurrence map, its cells those under the pixels'
        // centres rather than the 6 to 9 cells of each pixel's square
        Wafer far = Wafer.of(2.6, -2000 / 2.6, 31.5, 1e6, 0, 0);
        Footprint f = far.footprint();
        assertThat(RecurrenceMap.accepts(f)).isFalse();
        assertThat(f.covered().cardinality()).isEqualTo(N * N);
        Wafer near = Wafer.of(2.6, 31.5, 31.5, 1e6, 0, 0);
        assertThat(near.footprint().covered().cardinality()).as("every cell of the map's area")
                .isGreaterThan(6 * N * N);
    }

    @Test
    void atOrBelowTheCellSizeEachPixelMarksTheCellUnderItsCentre() {
        for (double pitch : new double[] {0.25, 0.5, 0.8, 1.0}) {
            for (double[] c : new double[][] {{31.5, 31.5}, {20.25, 40.7}, {-3, 70}}) {
                Random rnd = new Random(Double.hashCode(pitch) * 31L + Double.hashCode(c[0]));
                PixelGrid g = new PixelGrid(N, N - 5, pitch, c[0], c[1]);
                int[] indices = new int[N * (N - 5)];
                int count = 0;
                BitSet flagged = new BitSet();
                for (int i = 0; i < N * (N - 5); i++) {
                    if (rnd.nextInt(10) > 0) {
                        indices[count++] = i;
                        if (rnd.nextInt(25) == 0) {
                            flagged.set(i);
                        }
                    }
                }
                Footprint f = Footprint.of("round-156", g, indices, count, flagged);
                // the cells under the pixels' centres, one pixel at a time
                BitSet covered = new BitSet();
                BitSet hit = new BitSet();
                for (int k = 0; k < count; k++) {
                    int p = indices[k];
                    int i = (int) Math.floor(g.xMm(p % N) + 0.5) - f.minI();
                    int j = (int) Math.floor(g.yMm(p / N) + 0.5) - f.minJ();
                    assertThat(i).isBetween(0, f.width() - 1);
                    assertThat(j).isBetween(0, f.height() - 1);
                    covered.set(j * f.width() + i);
                    if (flagged.get(p)) {
                        hit.set(j * f.width() + i);
                    }
                }
                assertThat(f.covered()).as("covered at %s mm", pitch).isEqualTo(covered);
                assertThat(f.flagged()).as("flagged at %s mm", pitch).isEqualTo(hit);
                assertThat(f.minI()).isEqualTo((int) Math.floor(g.xMm(0) + 0.5));
                assertThat(f.minI() + f.width() - 1).isEqualTo((int) Math.floor(g.xMm(N - 1) + 0.5));
                assertThat(f.minJ()).isEqualTo((int) Math.floor(g.yMm(N - 6) + 0.5));
                assertThat(f.minJ() + f.height() - 1).isEqualTo((int) Math.floor(g.yMm(0) + 0.5));
            }
        }
    }
}
