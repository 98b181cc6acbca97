package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import java.util.BitSet;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

/**
 * A recurrence map always reads back: a wafer placed a billion millimetres from its centre (a map with a centre far
 * outside its data, at a coarse pitch) is left out of the recurrence maps with a reason, and the map writers refuse a
 * centre the readers would refuse.
 */
class RecurrenceCentreTest {
    @TempDir
    Path dir;

    private static Footprint footprint(int i0, int j0) {
        BitSet covered = new BitSet();
        covered.set(0, 4);
        BitSet flagged = new BitSet();
        flagged.set(0);
        return new Footprint("m2", 1.0, i0, j0, 2, 2, covered, flagged);
    }

    @Test
    void aFootprintABillionMillimetresAwayIsLeftOutWithItsReason() throws Exception {
        RecurrenceMap r = new RecurrenceMap();
        assertThat(r.add(footprint(-1, -1))).isTrue();
        assertThat(r.add(footprint(-1_000_000_001, 0))).isFalse();
        assertThat(r.refused()).singleElement().asString().startsWith("family m2: a wafer evaluated up to 1.000000001E9"
                + " mm from its centre");
        WaferMap m = r.maps().get("m2");
        assertThat(m.width()).isEqualTo(2);
        assertThat(r.waferCounts()).containsEntry("m2", 1);
        // what is left writes and reads back
        Path f = dir.resolve("recurrence-m2.tif");
        MapFiles.write(m, f);
        assertThat(MapFiles.readSingle(f).grid()).isEqualTo(m.grid());
    }

    @Test
    void aWaferWithItsCentreFarOutsideItsDataGivesNoRecurrenceMap() {
        // a 20 × 20 map at 100 mm pitch whose centre is 1e7 px (1e9 mm) to the left of its first column: the reader
        // accepts it (|centre| <= 1e9 px), but in 1 mm cells its wafer lies 1e9 mm from the centre
        PixelGrid g = new PixelGrid(20, 20, 100, -1e7, 10);
        int[] all = java.util.stream.IntStream.range(0, 400).toArray();
        Footprint f = Footprint.of("unfitted", g, all, all.length, new BitSet());
        RecurrenceMap r = new RecurrenceMap();
        assertThat(r.add(f)).isFalse();
        assertThat(r.maps()).isEmpty();
        assertThat(r.refused()).hasSize(1);
    }

    @Test
    void aWriterRefusesACentreItsReaderWouldRefuse() throws Exception {
        float[] s = new float[16];
        java.util.Arrays.fill(s, 0.5f);
        WaferMap far = new WaferMap(FloatRaster.wrap(4, 4, s), new PixelGrid(4, 4, 1, 1.5e9, 2), Quantity.FRACTION,
                "far", MeasurementConditions.UNKNOWN, Provenance.of("test"));
        for (String name : new String[] {"far.tif", "far.csv"}) {
            Path f = dir.resolve(name);
            assertThatThrownBy(() -> MapFiles.write(far, f)).isInstanceOf(IllegalArgumentException.class)
                    .hasMessageContaining("centre_x_px 1.5E9 px is outside [-1e9, 1e9] px");
            assertThat(f).doesNotExist();
        }
        // at the limit it writes and reads back
        WaferMap edge = new WaferMap(FloatRaster.wrap(4, 4, s), new PixelGrid(4, 4, 1, -1e9, 2), Quantity.FRACTION,
                "edge", MeasurementConditions.UNKNOWN, Provenance.of("test"));
        Path f = dir.resolve("edge.tif");
        MapFiles.write(edge, f);
        assertThat(MapFiles.readSingle(f).grid().centreXPx()).isEqualTo(-1e9);
    }
}
