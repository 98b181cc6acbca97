package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

class PointGriddingTest {
    private static final Sidecar NO_META = new Sidecar(null, null, null, null, null, null, null, null, null, null,
            null, null, List.of());
    private static final CsvHeader NO_HEADER = new CsvHeader(NO_META, Map.of(), null, null);

    private static PointGridding.Points points(double... xyv) {
        PointGridding.Points p = new PointGridding.Points();
        for (int i = 0; i < xyv.length; i += 3) {
            p.add(xyv[i], xyv[i + 1], (float) xyv[i + 2], i / 3 + 2);
        }
        return p;
    }

    @Test
    void pitchIsTheMostCommonSpacingOfTheSmallerAxis() {
        // x spacings 0.5, 0.5, 1.0; y spacing 2
        PointGridding.Points p = points(0, 0, 1, 0.5, 0, 1, 1, 2, 1, 2, 2, 1);

        assertThat(PointGridding.inferPitch(p)).isEqualTo(0.5);
        assertThat(PointGridding.inferPitch(points(3, 4, 1))).isNull();
    }

    @Test
    void spacingsWithRoundingNoiseCountAsOne() {
        PointGridding.Points p = points(0, 0, 1, 0.1 + 0.2, 0, 1, 0.6000000001, 0, 1, 0.9, 0, 1, 1.5, 0, 1);

        assertThat(PointGridding.inferPitch(p)).isEqualTo(0.3);
    }

    @Test
    void placementPutsTopLeftAtPixelZeroAndCentreAtTheOrigin() {
        PointGridding.Points p = points(-1, 1, 1, 1, 1, 2, -1, -1, 3);

        PointGridding.Placement place = PointGridding.place(p, 1.0, NO_META, NO_HEADER);

        assertThat(place.offGrid()).isEqualTo(-1);
        assertThat(place.width()).isEqualTo(3);
        assertThat(place.height()).isEqualTo(3);
        assertThat(place.col()).containsExactly(0, 2, 0);
        assertThat(place.row()).containsExactly(0, 0, 2);
        assertThat(place.cx()).isEqualTo(1.0);
        assertThat(place.cy()).isEqualTo(1.0);
    }

    @Test
    void placementNamesTheFirstPointOffTheGrid() {
        PointGridding.Points p = points(0, 0, 1, 1, 0, 1, 1.4, 0, 1, 2, 0, 1);

        assertThat(PointGridding.place(p, 1.0, NO_META, NO_HEADER).offGrid()).isEqualTo(2);
    }

    @Test
    void givenCentreAndSizeFixTheRasterBeyondThePoints() {
        Sidecar meta = new Sidecar(null, null, null, 1.0, 4.5, 4.5, null, null, null, null, null, null, List.of());
        CsvHeader header = new CsvHeader(meta, Map.of(), 10L, 10L);
        PointGridding.Points p = points(0.5, 0.5, 1);

        PointGridding.Placement place = PointGridding.place(p, 1.0, meta, header);

        assertThat(place.width()).isEqualTo(10);
        assertThat(place.height()).isEqualTo(10);
        assertThat(place.col()).containsExactly(5);
        assertThat(place.row()).containsExactly(4);
    }
}
