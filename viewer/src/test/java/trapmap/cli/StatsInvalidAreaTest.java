package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/**
 * {@code stats} reports the unusable share of the evaluated area with its causes, which pixels each statistic left
 * out and why, and warns above the default limit of invalid_area_fraction.
 */
class StatsInvalidAreaTest {
    private static final int N = 101;
    private static final PixelGrid GRID = PixelGrid.centred(N, N, 1.0);
    /** The evaluated area of {@code --wafer round-100-flat --edge-exclusion-mm 5}, every pixel. */
    private static final Mask AREA = WaferFormat.byId("round-100-flat").shape().mask(GRID, 5);

    @TempDir
    Path dir;

    /**
     * 50 µs on a 100 mm wafer; in the evaluated area, in scan order: {@code nan} NaN, {@code zero} zero,
     * {@code negative} −2 µs and {@code floor} 0.0005 µs (under the conversion's 1 ns floor) pixels; outside it (the
     * first pixels of the map, beyond the wafer) zeros and negatives that must not count.
     */
    private Path map(int nan, int zero, int negative, int floor) throws Exception {
        float[] s = new float[N * N];
        java.util.Arrays.fill(s, 50f);
        int k = 0;
        for (int i = AREA.nextIndex(0); i >= 0 && k < nan + zero + negative + floor; i = AREA.nextIndex(i + 1), k++) {
            s[i] = k < nan ? Float.NaN : k < nan + zero ? 0f : k < nan + zero + negative ? -2f : 5e-4f;
        }
        for (int i = 0; i < 5; i++) {
            assertThat(AREA.containsIndex(i)).isFalse();
            s[i] = i % 2 == 0 ? 0f : -1f;
        }
        Path f = dir.resolve("w.tif");
        MapFiles.write(new WaferMap(FloatRaster.wrap(N, N, s), GRID, Quantity.EFFECTIVE_LIFETIME, "w",
                MeasurementConditions.UNKNOWN, Provenance.of("test")), f);
        return f;
    }

    private static String[] args(Path f, String... more) {
        String[] base = {"stats", f.toString(), "--wafer", "round-100-flat", "--edge-exclusion-mm", "5"};
        String[] all = java.util.Arrays.copyOf(base, base.length + more.length);
        System.arraycopy(more, 0, all, base.length, more.length);
        return all;
    }

    @Test
    void jsonCountsEachCauseAndWhatTheStatisticsLeftOut() throws Exception {
        JsonNode j = Cli.json(args(map(11, 40, 6, 3), "--json"));
        JsonNode inv = j.get("invalid_area");
        int e = AREA.count();
        assertThat(inv.get("evaluated_count").asInt()).isEqualTo(e);
        assertThat(inv.get("non_finite_count").asInt()).isEqualTo(11);
        assertThat(inv.get("non_positive_count").asInt()).isEqualTo(46);
        assertThat(inv.get("invalid_conversion_count").asInt()).isEqualTo(3);
        assertThat(inv.get("count").asInt()).isEqualTo(60);
        assertThat(inv.get("fraction").asDouble()).isCloseTo(60.0 / e, within(1e-15));
        assertThat(inv.get("area_mm2").asDouble()).isCloseTo(60.0, within(1e-9));
        assertThat(inv.get("default_limit").asDouble()).isEqualTo(0.05);
        assertThat(inv.get("above_default_limit").asBoolean()).isFalse();
        // the statistics count the pixels with data; the means of positive values leave out the 46 pixels <= 0
        assertThat(j.get("count").asInt()).isEqualTo(e - 11);
        JsonNode left = j.get("left_out");
        assertThat(left).hasSize(2);
        assertThat(left.get(0).get("count").asInt()).isEqualTo(11);
        assertThat(left.get(0).get("statistics").asText()).isEqualTo("all");
        assertThat(left.get(1).get("count").asInt()).isEqualTo(46);
        assertThat(left.get(1).get("statistics").asText()).isEqualTo("harmonic_mean, geometric_mean");
        assertThat(left.get(1).get("reason").asText()).contains("<= 0");
        assertThat(j.get("warnings")).isNull();
    }

    @Test
    void aMapWithAThirdOfItsPixelsAtZeroIsWarnedAboutAndItsHarmonicMeanIsExplained() throws Exception {
        int zeros = (int) Math.floor(0.34 * AREA.count());
        Path f = map(0, zeros, 0, 0);
        Cli.Run r = Cli.run(args(f));
        assertThat(r.code()).isZero();
        assertThat(r.out()).containsPattern("invalid area\\s+0\\.3399 of the evaluated area \\(" + zeros + " of "
                + AREA.count() + " px: non-finite 0, non-positive " + zeros + ", invalid conversion 0\\)");
        assertThat(r.out()).contains("left out of harmonic_mean, geometric_mean: " + zeros + " px, value <= 0");
        assertThat(r.out()).contains("warning: invalid_area_fraction 0.34 > 0.05 (default limit)");
        assertThat(r.out()).containsPattern("harmonic mean \\(" + zeros + " px <= 0 left out\\)\\s+50 µs");
        // the zeros do not lower the harmonic mean: it is that of the 50 µs pixels
        assertThat(Cli.json(args(f, "--json")).get("harmonic_mean").asDouble()).isCloseTo(50, within(1e-9));
    }

    @Test
    void aMedianOfZeroBesideAPositiveHarmonicMeanSaysWhichStatisticsCountTheZeros() throws Exception {
        int zeros = AREA.count() / 2 + 10;
        Path f = map(0, zeros, 0, 0);
        Cli.Run r = Cli.run(args(f));
        assertThat(r.code()).isZero();
        assertThat(r.out()).containsPattern("median \\(" + zeros + " px <= 0 included\\)\\s+0 µs");
        assertThat(r.out()).containsPattern("mean \\(" + zeros + " px <= 0 included\\)\\s+2\\d\\.\\d+ µs");
        assertThat(r.out()).containsPattern("harmonic mean \\(" + zeros + " px <= 0 left out\\)\\s+50 µs");
        assertThat(r.out()).containsPattern("geometric mean \\(" + zeros + " px <= 0 left out\\)\\s+50 µs");
        assertThat(r.out()).containsPattern("5th percentile \\(" + zeros + " px <= 0 included\\)\\s+0 µs");
        JsonNode j = Cli.json(args(f, "--json"));
        assertThat(j.get("median").asDouble()).isZero();
        assertThat(j.get("harmonic_mean").asDouble()).isCloseTo(50, within(1e-9));
        assertThat(j.get("left_out").get(0).get("statistics").asText()).isEqualTo("harmonic_mean, geometric_mean");
        assertThat(j.get("left_out").get(0).get("count").asInt()).isEqualTo(zeros);
        JsonNode in = j.get("non_positive_included");
        assertThat(in.get("count").asInt()).isEqualTo(zeros);
        assertThat(in.get("statistics").asText()).isEqualTo("mean, median, p5, p95, min, max, std");
        // a map without values <= 0 says nothing of them
        Path clean = map(0, 0, 0, 0);
        assertThat(Cli.run(args(clean)).out()).doesNotContain("<= 0");
        assertThat(Cli.json(args(clean, "--json")).has("non_positive_included")).isFalse();
    }

    @Test
    void withADefectTheConversionsStatusesDecide() throws Exception {
        JsonNode j = Cli.json(args(map(2, 3, 4, 5), "--defect", "fe-i", "--doping", "p:1e16", "--injection",
                "1e15", "--json"));
        JsonNode inv = j.get("invalid_area");
        assertThat(inv.get("non_finite_count").asInt()).isEqualTo(2);
        assertThat(inv.get("non_positive_count").asInt()).isEqualTo(7);
        assertThat(inv.get("invalid_conversion_count").asInt()).isEqualTo(5);
        JsonNode all = j.get("left_out").get(0);
        assertThat(all.get("statistics").asText()).isEqualTo("all");
        assertThat(all.get("count").asInt()).isEqualTo(AREA.count() - j.get("count").asInt());
        assertThat(all.get("count").asInt()).isGreaterThanOrEqualTo(14);
    }
}
