package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.BitSet;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.WaferMap;

/** The recurrence files shared by the batch and the store's recurrence: maps, pictures, tables and hot spots. */
class RecurrenceFilesTest {
    @TempDir
    Path dir;

    /**
     * {@code n} wafers of {@code family} covering cells [-5, 5)², the first {@code hit} of them flagged at the 2×2
     * cells i in {2, 3}, j in {-3, -2} (centres (2.5, -2.5) mm between them).
     */
    private static RecurrenceMap recurrence(String family, int n, int hit) {
        RecurrenceMap m = new RecurrenceMap();
        for (int k = 0; k < n; k++) {
            BitSet covered = new BitSet();
            covered.set(0, 100);
            BitSet flagged = new BitSet();
            if (k < hit) {
                for (int j = -3; j <= -2; j++) {
                    for (int i = 2; i <= 3; i++) {
                        flagged.set((j + 5) * 10 + (i + 5));
                    }
                }
            }
            m.add(new Footprint(family, Footprint.PITCH_MM, -5, -5, 10, 10, covered, flagged));
        }
        return m;
    }

    @Test
    void anUngroupedFolderHasTheBatchTableAndOneMapAndPicturePerFamily() throws Exception {
        RecurrenceMap m = recurrence("round-200", 8, 4);
        m.addAll(recurrence("g/12", 3, 0));
        List<Path> written = RecurrenceFiles.write(dir, RecurrenceFiles.of(m), false, true);
        assertThat(written).extracting(p -> p.getFileName().toString()).containsExactly("recurrence-g_12.tif",
                "recurrence-g_12.png", "recurrence-round-200.tif", "recurrence-round-200.png");
        assertThat(Files.readString(dir.resolve("recurrence.csv"))).isEqualTo("family,wafers,file\n"
                + "g/12,3,recurrence-g_12.tif\n" + "round-200,8,recurrence-round-200.tif\n");
        WaferMap back = MapFiles.read(dir.resolve("recurrence-round-200.tif")).get(0);
        // 4 of 8 wafers flagged at cell (2, -2): the fraction 0.5 there, 0 elsewhere
        assertThat(at(back, 2.0, -2.0)).isEqualTo(0.5f);
        assertThat(at(back, -4.0, 4.0)).isEqualTo(0f);
    }

    private static float at(WaferMap m, double xMm, double yMm) {
        return m.raster().get((int) Math.round(m.grid().xPx(xMm)), (int) Math.round(m.grid().yPx(yMm)));
    }

    @Test
    void withoutPicturesAnEarlierPictureIsRemoved() throws Exception {
        Path png = dir.resolve("recurrence-round-200.png");
        Files.writeString(png, "old picture");
        List<Path> written = RecurrenceFiles.write(dir, RecurrenceFiles.of(recurrence("round-200", 6, 3)), false,
                false);
        assertThat(written).extracting(p -> p.getFileName().toString()).containsExactly("recurrence-round-200.tif");
        assertThat(png).doesNotExist();
    }

    @Test
    void groupedMapsHaveAGroupColumnAndStemsThatNeverCollide() throws Exception {
        Recurrence a = recurrence("round-200", 6, 3).families().get("round-200");
        Recurrence b = recurrence("round-200", 5, 0).families().get("round-200");
        Recurrence c = recurrence("round-200", 5, 0).families().get("round-200");
        RecurrenceFiles.write(dir, List.of(new RecurrenceFiles.Entry("7", a), new RecurrenceFiles.Entry("a/b", b),
                new RecurrenceFiles.Entry("a_b", c)), true, false);
        assertThat(Files.readString(dir.resolve("recurrence.csv"))).isEqualTo("group,family,wafers,file\n"
                + "7,round-200,6,recurrence-7-round-200.tif\n" + "a/b,round-200,5,recurrence-a_b-round-200.tif\n"
                + "a_b,round-200,5,recurrence-a_b-round-200-2.tif\n");
        Set<String> used = new HashSet<>();
        assertThat(RecurrenceFiles.stem(null, "m 2", used)).isEqualTo("recurrence-m_2");
        assertThat(RecurrenceFiles.stem(null, "m:2", used)).isEqualTo("recurrence-m_2-2");
    }

    @Test
    void hotSpotsAreListedWithTheirCellsPeakShareAndCentroid() throws Exception {
        // 10 wafers, 4 flagged at the same 2x2 cells: 40 % > 25 % on cells all 10 wafers cover -> one hot spot
        Recurrence hot = recurrence("round-200", 10, 4).families().get("round-200");
        // 10 wafers, 2 flagged: 20 %, not above 25 % -> none
        Recurrence cold = recurrence("round-200", 10, 2).families().get("round-200");
        List<RecurrenceFiles.Entry> entries = List.of(new RecurrenceFiles.Entry("3", cold),
                new RecurrenceFiles.Entry("7", hot));
        assertThat(RecurrenceFiles.hotSpotRows(entries, HotSpots.Criteria.DEFAULT))
                .containsExactly(List.of("7", "round-200", "10", "1", "4", "0.4", "2.5", "-2.5"));
        Path csv = RecurrenceFiles.writeHotSpots(dir, entries, HotSpots.Criteria.DEFAULT);
        assertThat(Files.readString(csv)).isEqualTo(
                "group,family,wafers,spot,cells,peak_share,centroid_x_mm,centroid_y_mm\n"
                        + "7,round-200,10,1,4,0.4,2.5,-2.5\n");
    }
}
