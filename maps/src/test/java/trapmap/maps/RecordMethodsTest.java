package trapmap.maps;

import static org.assertj.core.api.Assertions.assertThat;

import java.lang.reflect.RecordComponent;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.Function;
import org.junit.jupiter.api.Test;
import trapmap.maps.batch.Figure;
import trapmap.maps.raster.PixelGrid;

/**
 * Records whose {@code equals} and {@code hashCode} are written out (so that no run spins the method handles of the
 * generated ones) behave as the generated ones: each is compared with a twin record of the same components whose
 * methods the compiler generates, on every pair of a set of values that differ in one component at a time (with
 * -0.0 against 0.0 and NaN, which the generated methods tell apart and equate through {@link Double#compare}). The
 * twin's components are checked against the record's, so that a component added later fails here until both are
 * written again.
 */
class RecordMethodsTest {
    record GridTwin(int width, int height, double pitchMm, double centreXPx, double centreYPx) {
    }

    record FigureTwin(String name, Figure.Kind kind, double percent) {
    }

    @Test
    void pixelGridEqualsAndHashesAsTheGeneratedRecord() {
        assertSameComponents(PixelGrid.class, GridTwin.class);
        List<PixelGrid> grids = new ArrayList<>();
        for (int width : new int[] {1, 1024}) {
            for (int height : new int[] {1, 1024}) {
                for (double pitch : new double[] {0.1, 0.15, 0.1000000000000001}) {
                    for (double cx : new double[] {0.0, -0.0, 511.5}) {
                        for (double cy : new double[] {0.0, -0.0, 511.5, -3.25}) {
                            grids.add(new PixelGrid(width, height, pitch, cx, cy));
                        }
                    }
                }
            }
        }
        assertLikeTwins(grids, g -> new GridTwin(g.width(), g.height(), g.pitchMm(), g.centreXPx(), g.centreYPx()));
        PixelGrid g = PixelGrid.centred(1024, 1024, 0.15);
        assertThat(g).isEqualTo(PixelGrid.centred(1024, 1024, 0.15)).isNotEqualTo(null).isNotEqualTo("grid");
    }

    @Test
    void figureEqualsAndHashesAsTheGeneratedRecord() {
        assertSameComponents(Figure.class, FigureTwin.class);
        List<Figure> figures = new ArrayList<>();
        for (String name : new String[] {"p10_lifetime_us", "p90_lifetime_us", "median_lifetime_us", null}) {
            for (Figure.Kind kind : new Figure.Kind[] {Figure.Kind.LIFETIME_PERCENTILE, Figure.Kind.MEDIAN_LIFETIME,
                    null}) {
                for (double percent : new double[] {10, 90, 0.0, -0.0, Double.NaN}) {
                    figures.add(new Figure(name, kind, percent));
                }
            }
        }
        figures.add(Figure.parse("p10_lifetime_us"));
        figures.add(Figure.parse("median_lifetime_us"));
        assertLikeTwins(figures, f -> new FigureTwin(f.name(), f.kind(), f.percent()));
        assertThat(Figure.parse("p10_lifetime_us")).isEqualTo(Figure.parse("p10_lifetime_us")).isNotEqualTo(null)
                .isNotEqualTo(new FigureTwin("p10_lifetime_us", Figure.Kind.LIFETIME_PERCENTILE, 10));
    }

    /** Every pair: equal exactly when the twins are; each hash that of its twin. */
    private static <R extends Record, T extends Record> void assertLikeTwins(List<R> values, Function<R, T> twin) {
        int equalPairs = 0;
        for (R a : values) {
            assertThat(a.hashCode()).as("hash of %s", a).isEqualTo(twin.apply(a).hashCode());
            for (R b : values) {
                boolean expected = twin.apply(a).equals(twin.apply(b));
                assertThat(a.equals(b)).as("%s equals %s", a, b).isEqualTo(expected);
                equalPairs += expected ? 1 : 0;
            }
        }
        // the values are all different but for the copies added on purpose: equality is not vacuous either way
        assertThat(equalPairs).isGreaterThan(values.size() - 1).isLessThan(values.size() * values.size() / 2);
    }

    private static void assertSameComponents(Class<? extends Record> record, Class<? extends Record> twin) {
        assertThat(describe(twin.getRecordComponents())).isEqualTo(describe(record.getRecordComponents()));
    }

    private static List<String> describe(RecordComponent[] components) {
        return Arrays.stream(components).map(c -> c.getName() + ":" + c.getGenericType().getTypeName()).toList();
    }
}
