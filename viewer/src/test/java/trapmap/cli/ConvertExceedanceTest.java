package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.ExceedanceMaps;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.uncertainty.ConditionUncertainty;

/** {@code convert --quantity exceedance-probability | density-quantile}, end to end. */
class ConvertExceedanceTest {
    private static final MeasurementConditions CONDITIONS = new MeasurementConditions(Doping.pType(1e16), 180.0,
            null, 1e14, null, 10.0, null, null, Map.of());

    @TempDir
    Path dir;

    private Path lifetimeMap(MeasurementConditions c) throws Exception {
        float[] tau = new float[8 * 5];
        for (int i = 0; i < tau.length; i++) {
            tau[i] = (float) (40 * Math.pow(10, i / 39.0));  // 40 … 400 µs
        }
        tau[3] = Float.NaN;
        WaferMap map = new WaferMap(FloatRaster.wrap(8, 5, tau), PixelGrid.centred(8, 5, 1.0),
                Quantity.EFFECTIVE_LIFETIME, "t1", c, Provenance.of("test"));
        Path file = dir.resolve("t1.tif");
        MapFiles.write(map, file);
        return file;
    }

    @Test
    void probabilityMapEqualsTheMapsLevelMapWithTheFilesUncertainty() throws Exception {
        Path in = lifetimeMap(CONDITIONS);
        Path physics = dir.resolve("physics.json");
        Files.writeString(physics, "{\"uncertainty\": {\"srv_relative\": 0.2, \"seed\": 9}}");
        Path out = dir.resolve("p.tif");
        JsonNode s = Cli.json("convert", in.toString(), "--defect", "fe-i", "--quantity", "exceedance-probability",
                "--threshold", "1e11", "--samples", "3000", "--physics", physics.toString(), "-o", out.toString(),
                "--json");
        assertThat(s.get("quantity").asText()).isEqualTo("exceedance-probability");
        assertThat(s.get("threshold_cm3").asDouble()).isEqualTo(1e11);
        assertThat(s.get("uncertainty").get("samples").asInt()).isEqualTo(3000);
        assertThat(s.get("uncertainty").get("seed").asLong()).isEqualTo(9);
        assertThat(s.get("uncertainty").get("srv_relative").asDouble()).isEqualTo(0.2);
        assertThat(s.get("pixels_no_value").asInt()).isEqualTo(1);
        WaferMap p = MapFiles.readSingle(out);
        assertThat(p.quantity()).isEqualTo(Quantity.EXCEEDANCE_PROBABILITY);
        ExceedanceMaps ref = ExceedanceMaps.prepare(CONDITIONS, DefectLibrary.byId("fe-i"),
                ConversionSettings.DEFAULTS, new ConditionUncertainty(0.05, 0.02, 0.2, 0.1, 1, 0.03), 1e11, 3000, 9);
        WaferMap in2 = MapFiles.readSingle(in);
        float[] expected = ref.probabilityMap(in2, 1).raster().samples();
        assertThat(p.raster().samples()).containsExactly(expected);
        assertThat(expected[0]).isGreaterThan(0.9f);
        assertThat(expected[39]).isLessThan(0.1f);
    }

    @Test
    void quantileMapsBracketTheNominalDensity() throws Exception {
        Path in = lifetimeMap(CONDITIONS);
        Path nt = dir.resolve("nt.tif");
        Path lo = dir.resolve("q05.tif");
        Path hi = dir.resolve("q95.tif");
        assertThat(Cli.run("convert", in.toString(), "--defect", "fe-i", "-o", nt.toString()).code()).isZero();
        Cli.Run r = Cli.run("convert", in.toString(), "--defect", "fe-i", "--quantity", "density-quantile",
                "--quantile", "0.05", "--samples", "2000", "-o", lo.toString());
        assertThat(r.err()).isEmpty();
        assertThat(r.out()).contains("density-quantile (cm^-3) of fe-i").contains("2000 samples, seed 1");
        assertThat(Cli.run("convert", in.toString(), "--defect", "fe-i", "--quantity", "density-quantile",
                "--samples", "2000", "-o", hi.toString()).code()).isZero();
        float[] n = MapFiles.readSingle(nt).raster().samples();
        float[] a = MapFiles.readSingle(lo).raster().samples();
        float[] b = MapFiles.readSingle(hi).raster().samples();
        assertThat(MapFiles.readSingle(hi).provenance().steps()).anySatisfy(st -> assertThat(st.parameters())
                .containsEntry("quantile", "0.95"));
        int inside = 0;
        for (int i = 0; i < n.length; i++) {
            if (Float.isNaN(n[i])) {
                assertThat(a[i]).isNaN();
                continue;
            }
            assertThat(a[i]).isLessThanOrEqualTo(b[i]);
            inside += a[i] < n[i] && n[i] < b[i] ? 1 : 0;
        }
        assertThat(inside).isGreaterThan(30);
    }

    @Test
    void aFixedGenerationRateGivesProbabilitiesButNoQuantiles() throws Exception {
        Path in = lifetimeMap(CONDITIONS);
        Path out = dir.resolve("g.tif");
        JsonNode s = Cli.json("convert", in.toString(), "--defect", "fe-i", "--quantity", "exceedance-probability",
                "--threshold", "1e11", "--generation", "1e19", "--samples", "1000", "-o", out.toString(), "--json");
        assertThat(s.get("pixels_valid").asInt()).isEqualTo(39);
        MeasurementConditions g = CONDITIONS.withInjection(null).withGeneration(1e19);
        ExceedanceMaps ref = ExceedanceMaps.prepare(g, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS,
                ConditionUncertainty.DEFAULTS, 1e11, 1000, 1);
        assertThat(MapFiles.readSingle(out).raster().samples())
                .containsExactly(ref.probabilityMap(MapFiles.readSingle(in).withConditions(g), 1).raster().samples());
        Cli.Run r = Cli.run("convert", in.toString(), "--defect", "fe-i", "--quantity", "density-quantile",
                "--generation", "1e19", "-o", dir.resolve("q.tif").toString());
        assertThat(r.code()).isNotZero();
        assertThat(r.err()).contains("density quantiles under a fixed generation rate are not supported");
    }

    @Test
    void badRequestsAreRefusedWithTheFlagNamed() throws Exception {
        Path in = lifetimeMap(CONDITIONS);
        String out = dir.resolve("x.tif").toString();
        assertThat(Cli.run("convert", in.toString(), "--defect", "fe-i", "--quantity", "exceedance-probability",
                "-o", out).err()).contains("needs --threshold (N* in cm^-3)");
        assertThat(Cli.run("convert", in.toString(), "--defect", "fe-i", "--quantity", "density-quantile",
                "--quantile", "1", "-o", out).err()).contains("--quantile must lie strictly between 0 and 1");
        assertThat(Cli.run("convert", in.toString(), "--defect", "fe-i", "--threshold", "1e11", "-o", out).err())
                .contains("--threshold, --quantile, --samples and --seed belong to --quantity");
        assertThat(Cli.run("convert", in.toString(), "--defect", "fe-i", "--quantity", "exceedance-probability",
                "--threshold", "1e11", "--samples", "5", "-o", out).err()).contains("--samples must be in [16,");
        assertThat(Cli.run("convert", in.toString(), "--defect", "fe-i", "--quantity", "exceedance-probability",
                "--threshold", "-1", "-o", out).err()).contains("--threshold").contains("cm^-3");
        Path physics = dir.resolve("bad.json");
        Files.writeString(physics, "{\"uncertainty\": {\"temperature_k\": 99}}");
        assertThat(Cli.run("convert", in.toString(), "--defect", "fe-i", "--quantity", "exceedance-probability",
                "--threshold", "1e11", "--physics", physics.toString(), "-o", out).err())
                .contains("--physics " + physics + ": field 'uncertainty.temperature_k'").contains("(K)");
        assertThat(Files.exists(Path.of(out))).isFalse();
    }
}
