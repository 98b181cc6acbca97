package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PixelResult;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * {@code stats --defect}: statistics, the threshold and the regions use the OK pixels; the pixels below the
 * detection limit are counted on their own and never flagged as over a density threshold.
 */
class StatsBelowLimitTest {
    private static final int N = 101;

    @TempDir
    Path dir;

    @Test
    void theBestPixelsAreBelowTheLimitNotFlagged() throws Exception {
        TrapDensityConverter fe = new TrapDensityConverter(Conditions.of(Doping.pType(1e16), Injection.fixed(1e15)),
                DefectLibrary.byId("fe-i"));
        double tauLim = fe.convert(100).intrinsicLifetimeUs();
        // 100 mm round wafer: left (x < -17 mm) 0.9·τ_lim, middle 0.99·τ_lim, right (x > 17 mm) τ_lim
        PixelGrid g = PixelGrid.centred(N, N, 1.0);
        float[] s = new float[N * N];
        int left = 0;
        int inside = 0;
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                double xm = g.xMm(x);
                boolean in = Math.hypot(xm, g.yMm(y)) <= 50;
                s[y * N + x] = in ? (float) ((xm < -17 ? 0.9 : xm > 17 ? 1.0 : 0.99) * tauLim) : Float.NaN;
                inside += in ? 1 : 0;
                left += in && xm < -17 ? 1 : 0;
            }
        }
        Path f = dir.resolve("bands.tif");
        MapFiles.write(new WaferMap(FloatRaster.wrap(N, N, s), g, Quantity.EFFECTIVE_LIFETIME, "bands",
                MeasurementConditions.UNKNOWN, Provenance.of("test")), f);
        JsonNode j = Cli.json("stats", f.toString(), "--defect", "fe-i", "--doping", "p:1e16", "--injection", "1e15",
                "--threshold", "5e8", "--json");
        PixelResult worse = fe.convert((float) (0.9 * tauLim));
        // (the fitted outline may leave out a few rim pixels)
        int ok = j.get("count").asInt();
        assertThat(ok).isBetween((int) (0.99 * left), left);
        assertThat(j.get("median").asDouble()).isCloseTo(worse.trapDensityPerCm3(),
                within(1e-6 * worse.trapDensityPerCm3()));
        assertThat(j.get("max").asDouble()).isEqualTo(j.get("min").asDouble());
        JsonNode below = j.get("below_limit");
        int nBelow = below.get("count").asInt();
        assertThat(nBelow).isBetween((int) (0.99 * (inside - left)), inside - left);
        assertThat(below.get("area_fraction").asDouble()).isCloseTo((double) nBelow / (nBelow + ok), within(1e-12));
        assertThat(below.get("area_mm2").asDouble()).isCloseTo(nBelow, within(1e-9));
        JsonNode regions = j.get("regions");
        assertThat(regions).hasSize(1);
        assertThat(regions.get(0).get("max_x_mm").asDouble()).isLessThan(-17);
        assertThat(j.get("threshold").get("fraction_above").asDouble()).isEqualTo(1.0);

        Cli.Run table = Cli.run("stats", f.toString(), "--defect", "fe-i", "--doping", "p:1e16", "--injection",
                "1e15");
        assertThat(table.out()).contains("below detection limit").contains("not in the statistics");
        // without a defect the map is taken as read: no statuses, no below-limit count
        assertThat(Cli.json("stats", f.toString(), "--json").has("below_limit")).isFalse();
    }
}
