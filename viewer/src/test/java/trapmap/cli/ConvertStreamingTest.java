package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.EnumSet;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.WriteOptions;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/** {@code convert} to a TIFF file streams its bands; file and figures must be those of the whole-map conversion. */
class ConvertStreamingTest {
    @TempDir
    Path dir;

    /** A map of several bands of about a million pixels (1500 x 1500 pixels, bands of 699 rows). */
    private WaferMap map() {
        int w = 1500;
        int h = 1500;
        Random r = new Random(5);
        float[] tau = new float[w * h];
        for (int i = 0; i < tau.length; i++) {
            tau[i] = (float) Math.pow(10, 3 * r.nextDouble());
        }
        for (int i = 0; i < tau.length; i += 977) {
            tau[i] = Float.NaN;
        }
        tau[1234] = 1e-6f; // below the 1 ns floor
        MeasurementConditions c = new MeasurementConditions(Doping.pType(1e16), 180.0, null, 1e14, null, 10.0, null,
                null, Map.of());
        return new WaferMap(FloatRaster.wrap(w, h, tau), PixelGrid.centred(w, h, 0.1), Quantity.EFFECTIVE_LIFETIME,
                "s1", c, Provenance.of("test"));
    }

    @Test
    void streamedTiffEqualsTheWholeMapConversionForStreamedAndWholeInputs() throws Exception {
        WaferMap map = map();
        MapConversion.Result whole = MapConversion.convert(map, DefectLibrary.byId("fe-i"),
                ConversionSettings.DEFAULTS, EnumSet.of(Quantity.TRAP_DENSITY), 1);
        Path reference = dir.resolve("reference.tif");
        MapFiles.write(whole.get(Quantity.TRAP_DENSITY), reference);
        int[] counts = whole.statusCounts();
        for (WriteOptions.TiffCompression compression : new WriteOptions.TiffCompression[] {
            WriteOptions.TiffCompression.NONE, WriteOptions.TiffCompression.DEFLATE}) {
            Path in = dir.resolve("in-" + compression + ".tif");
            MapFiles.write(map, in, WriteOptions.DEFAULTS.withTiffCompression(compression));
            Path out = dir.resolve("out-" + compression + ".tif");
            Cli.Run r = Cli.run("convert", in.toString(), "--defect", "fe-i", "-o", out.toString());
            // warnings on stderr, the result alone on stdout
            assertThat(r.err().strip().lines()).allMatch(l -> l.startsWith("warning: "))
                    .contains("warning: LIFETIME_BELOW_FLOOR: 1 pixel(s) with a lifetime below 1 ns (0.001 µs) are"
                            + " invalid; their values look like lifetimes in seconds read as µs: give the map's unit"
                            + " (\"unit\": \"s\" in the sidecar, or # unit=s in a CSV file)");
            assertThat(r.code()).isZero();
            assertThat(r.out()).contains("pixels: " + counts[0] + " ok, " + counts[1] + " below the detection limit, "
                    + counts[2] + " invalid, " + counts[3] + " no data")
                    .doesNotContain("warning");
            Cli.Run j = Cli.run("convert", in.toString(), "--defect", "fe-i", "-o", out.toString(), "--json");
            assertThat(j.code()).isZero();
            assertThat(new com.fasterxml.jackson.databind.ObjectMapper().readTree(j.out()).get("warnings")
                    .toString()).contains("\"LIFETIME_BELOW_FLOOR: 1 pixel(s)");
            assertThat(j.err()).contains("warning: LIFETIME_BELOW_FLOOR");
            byte[] got = Files.readAllBytes(out);
            byte[] want = Files.readAllBytes(reference);
            if (compression == WriteOptions.TiffCompression.NONE) {
                assertThat(got).isEqualTo(want);
            } else { // the history names the input's compression and decoder: the samples must agree
                assertThat(MapFiles.readSingle(out).raster().samples())
                        .isEqualTo(MapFiles.readSingle(reference).raster().samples());
            }
            try (var files = Files.list(dir)) {
                assertThat(files.filter(p -> p.getFileName().toString().endsWith(".tmp"))).isEmpty();
            }
        }
    }
}
