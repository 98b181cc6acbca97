package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import org.apache.commons.math3.stat.descriptive.DescriptiveStatistics;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

class StatsCommandTest {
    private static final int N = 201;
    private static final double PITCH_MM = 0.5;

    @TempDir
    Path dir;

    /** A 100 mm round wafer at 0.5 mm pitch: 80 µs with a 5 mm radius spot of 4 µs centred at (20, −10) mm. */
    private Path wafer() throws Exception {
        float[] s = new float[N * N];
        PixelGrid g = PixelGrid.centred(N, N, PITCH_MM);
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                double xm = g.xMm(x);
                double ym = g.yMm(y);
                double v = Math.hypot(xm, ym) > 50 ? Float.NaN : Math.hypot(xm - 20, ym + 10) <= 5 ? 4 : 80;
                s[y * N + x] = (float) v;
            }
        }
        WaferMap m = new WaferMap(FloatRaster.wrap(N, N, s), g, Quantity.EFFECTIVE_LIFETIME, "round",
                MeasurementConditions.UNKNOWN, Provenance.of("test"));
        Path f = dir.resolve("round.tif");
        MapFiles.write(m, f);
        return f;
    }

    @Test
    void statisticsAgreeWithCommonsMathAndTheSpotIsLocated() throws Exception {
        Path f = wafer();
        JsonNode j = Cli.json("stats", f.toString(), "--threshold", "10", "--json");
        DescriptiveStatistics ref = new DescriptiveStatistics();
        for (float v : MapFiles.readSingle(f).raster().samples()) {
            if (!Float.isNaN(v)) {
                ref.addValue(v);
            }
        }
        assertThat(j.get("count").asInt()).isEqualTo((int) ref.getN());
        assertThat(j.get("mean").asDouble()).isCloseTo(ref.getMean(), within(1e-9));
        assertThat(j.get("std").asDouble()).isCloseTo(ref.getStandardDeviation(), within(1e-9));
        assertThat(j.get("geometric_mean").asDouble()).isCloseTo(ref.getGeometricMean(), within(1e-9));
        double harmonic = ref.getN() / java.util.Arrays.stream(ref.getValues()).map(v -> 1 / v).sum();
        assertThat(j.get("harmonic_mean").asDouble()).isCloseTo(harmonic, within(1e-9));
        assertThat(j.get("outline").get("source").asText()).isEqualTo("fitted");
        JsonNode regions = j.get("regions");
        assertThat(regions).hasSize(1);
        assertThat(regions.get(0).get("centroid_x_mm").asDouble()).isCloseTo(20, within(0.25));
        assertThat(regions.get(0).get("centroid_y_mm").asDouble()).isCloseTo(-10, within(0.25));
        assertThat(regions.get(0).get("area_mm2").asDouble()).isCloseTo(Math.PI * 25, within(3.0));
        assertThat(regions.get(0).get("edge_distance_mm").asDouble()).isCloseTo(50 - Math.hypot(20, 10) - 5,
                within(1.0));
        assertThat(j.get("threshold").get("flagged_fraction").asDouble())
                .isCloseTo(regions.get(0).get("pixels").asDouble() / j.get("count").asDouble(), within(1e-12));
    }

    @Test
    void theDemoMonitorsNotchIsReportedUnresolvedAtItsPitchNeverAsAFlat() throws Exception {
        // MON-200-W01 was generated as a 200 mm notched wafer at 0.8 mm pitch: the 1 mm notch is under two pixels
        JsonNode o = Cli.json("stats", Path.of("..", "demo-data", "MON-200-W01.tif").toString(), "--json")
                .get("outline");
        assertThat(o.get("family").asText()).isEqualTo("round-200");
        assertThat(o.get("format").isNull()).isTrue();
        assertThat(o.get("fiducial").asText()).isEqualTo("not-resolved");
        assertThat(o.get("fiducial_resolved").asBoolean()).isFalse();
        assertThat(o.get("within_tolerance").asBoolean()).isTrue();
        assertThat(o.get("pitch_mm").asDouble()).isEqualTo(0.8);
        assertThat(o.toString()).doesNotContain("\"round-200-flat\"");
        assertThat(o.get("format_sources").toString()).contains("SEMI M1");
    }

    @Test
    void theDemoPseudoSquaresGetTheirFormatWithinThePitchWidenedTolerance() throws Exception {
        for (String[] c : new String[][] {{"LOT-A01-W01.tif", "m2"}, {"LOT-N01-W01.tif", "m10"},
                {"LOT-N01-W03.tif", "g12"}}) {
            JsonNode o = Cli.json("stats", Path.of("..", "demo-data", c[0]).toString(), "--json").get("outline");
            assertThat(o.get("format").asText()).as(c[0]).isEqualTo(c[1]);
            assertThat(o.get("within_tolerance").asBoolean()).as(c[0]).isTrue();
            assertThat(o.get("fiducial").asText()).as(c[0]).isEqualTo("none");
            assertThat(o.get("deviation_mm").asDouble()).as(c[0]).isLessThanOrEqualTo(
                    o.get("tolerance_mm").asDouble());
        }
    }

    @Test
    void aRingsRegionSaysItsCentroidLiesOutsideIt() throws Exception {
        JsonNode j = Cli.json("stats", Path.of("..", "demo-data", "LOT-N01-W01.tif").toString(), "--defect",
                "midgap", "--threshold", "1e12", "--min-area-mm2", "4", "--edge-exclusion-mm", "2", "--json");
        JsonNode ring = j.get("regions").get(0); // largest first
        assertThat(ring.get("centroid_inside").asBoolean()).isFalse();
        double r = Math.hypot(ring.get("position_x_mm").asDouble(), ring.get("position_y_mm").asDouble());
        assertThat(r).isBetween(45.0, 65.0); // planted at r = 55 mm
        assertThat(Math.hypot(ring.get("centroid_x_mm").asDouble(), ring.get("centroid_y_mm").asDouble()))
                .isLessThan(2.0);
        assertThat(ring.get("max_x_mm").asDouble() - ring.get("min_x_mm").asDouble()).isGreaterThan(100);
    }

    @Test
    void withADefectTheOutlineFittedBesideTheConversionIsTheOneFittedToTheMapAsRead() throws Exception {
        Path f = wafer();
        JsonNode asRead = Cli.json("stats", f.toString(), "--json").get("outline");
        Cli.Run r = Cli.run("stats", f.toString(), "--defect", "fe-i", "--doping", "p:1e16", "--generation", "1e19",
                "--json");
        assertThat(r.code()).as(r.err()).isZero();
        assertThat(Cli.parse(r.out()).get("outline")).isEqualTo(asRead);
        assertThat(asRead.get("source").asText()).isEqualTo("fitted");
    }

    @Test
    void withADefectAnOutlineThatCannotBeFittedRefusesTheEdgeExclusion() throws Exception {
        float[] s = new float[9 * 9];
        java.util.Arrays.fill(s, Float.NaN);
        s[40] = 80;
        WaferMap m = new WaferMap(FloatRaster.wrap(9, 9, s), PixelGrid.centred(9, 9, PITCH_MM),
                Quantity.EFFECTIVE_LIFETIME, "dot", MeasurementConditions.UNKNOWN, Provenance.of("test"));
        Path f = dir.resolve("dot.tif");
        MapFiles.write(m, f);
        Cli.Run r = Cli.run("stats", f.toString(), "--defect", "fe-i", "--doping", "p:1e16", "--generation", "1e19",
                "--edge-exclusion-mm", "1", "--json");
        assertThat(r.code()).isNotZero();
        assertThat(r.out()).isEmpty();
        assertThat(r.err()).contains("--edge-exclusion-mm needs the wafer outline, which could not be fitted to "
                + f);
    }

    @Test
    void regionRowsComeLargestFirstWithTheirOwnFigures() throws Exception {
        // spots of radius 2, 3, ..., 7 mm on a line: each row must hold its own spot's figures, largest first
        float[] s = new float[N * N];
        PixelGrid g = PixelGrid.centred(N, N, PITCH_MM);
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                double xm = g.xMm(x);
                double ym = g.yMm(y);
                double v = Math.hypot(xm, ym) > 50 ? Float.NaN : 80;
                for (int k = 0; k < 6; k++) {
                    if (Math.hypot(xm - (-35 + 14 * k), ym) <= 2 + k) {
                        v = 4;
                    }
                }
                s[y * N + x] = (float) v;
            }
        }
        Path f = dir.resolve("spots.tif");
        MapFiles.write(new WaferMap(FloatRaster.wrap(N, N, s), g, Quantity.EFFECTIVE_LIFETIME, "spots",
                MeasurementConditions.UNKNOWN, Provenance.of("test")), f);
        JsonNode regions = Cli.json("stats", f.toString(), "--threshold", "10", "--json").get("regions");
        assertThat(regions).hasSize(6);
        for (int i = 0; i < 6; i++) {
            int k = 5 - i; // largest first
            JsonNode row = regions.get(i);
            assertThat(row.get("centroid_x_mm").asDouble()).isCloseTo(-35 + 14 * k, within(0.25));
            assertThat(row.get("centroid_y_mm").asDouble()).isCloseTo(0, within(0.25));
            assertThat(row.get("area_mm2").asDouble()).isCloseTo(row.get("pixels").asInt() * PITCH_MM * PITCH_MM,
                    within(1e-9));
            assertThat(row.get("area_mm2").asDouble()).isCloseTo(Math.PI * (2 + k) * (2 + k), within(3.0));
        }
    }

    @Test
    void edgeExclusionShrinksTheCountedArea() throws Exception {
        Path f = wafer();
        JsonNode all = Cli.json("stats", f.toString(), "--json");
        JsonNode inner = Cli.json("stats", f.toString(), "--edge-exclusion-mm", "5", "--json");
        double expected = Math.PI * 45 * 45 / (Math.PI * 50 * 50);
        assertThat(inner.get("area_mm2").asDouble() / all.get("area_mm2").asDouble()).isCloseTo(expected,
                within(0.02));
    }

    @Test
    void badOptionsGiveOneLine() throws Exception {
        Path f = wafer();
        Cli.Run r = Cli.run("stats", f.toString(), "--edge-exclusion-mm", "-1");
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).hasSize(1).first().asString().contains("--edge-exclusion-mm");
        Cli.Run w = Cli.run("stats", f.toString(), "--wafer", "round-99");
        assertThat(w.code()).isEqualTo(2);
        assertThat(w.errLines()).hasSize(1).first().asString().contains("--wafer");
    }

    @Test
    void regionOptionsWithoutAThresholdAreRefusedNotIgnored() {
        String map = Path.of("..", "demo-data", "LOT-A01-W01.tif").toString();
        for (String[] extra : new String[][] {{"--flag", "above"}, {"--flag", "sideways"}, {"--min-area-mm2", "4"}}) {
            Cli.Run r = Cli.run("stats", map, extra[0], extra[1]);
            assertThat(r.code()).as(extra[0]).isEqualTo(2);
            assertThat(r.errLines()).as(extra[0]).containsExactly("trapmap stats: " + extra[0] + " belongs to"
                    + " --threshold (the flagged regions): give --threshold in the map's unit (µs for lifetimes,"
                    + " cm^-3 for densities)");
            assertThat(r.out()).isEmpty();
        }
        assertThat(Cli.run("stats", map, "--threshold", "50", "--flag", "below", "--min-area-mm2", "4").code())
                .isZero();
    }
}
