package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import java.util.Map;
import org.assertj.core.data.Percentage;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.material.Doping;

/** {@code convert} without a defect: format conversions and lifetime maps. */
class ConvertWithoutDefectTest {
    @TempDir
    Path dir;

    private WaferMap map(Quantity q, MeasurementConditions c) {
        float[] v = new float[7 * 5];
        for (int i = 0; i < v.length; i++) {
            v[i] = 3.25f + 17.5f * i;
        }
        v[4] = Float.NaN;
        return new WaferMap(FloatRaster.wrap(7, 5, v), PixelGrid.centred(7, 5, 0.5), q, "W-07", c,
                Provenance.of("test"));
    }

    @Test
    void tiffToCsvToTiffKeepsTheSamplesAndTheMetadata() throws Exception {
        MeasurementConditions c = new MeasurementConditions(Doping.pType(2e15), 160.0, 305.0, 3e14, null, 12.0, null,
                null, Map.of());
        WaferMap original = map(Quantity.EFFECTIVE_LIFETIME, c);
        Path tif = dir.resolve("w07.tif");
        MapFiles.write(original, tif);
        Path csv = dir.resolve("w07.csv");
        Path back = dir.resolve("w07-back.tif");

        Cli.Run toCsv = Cli.run("convert", tif.toString(), "-o", csv.toString());
        assertThat(toCsv.err()).isEmpty();
        assertThat(toCsv.code()).isZero();
        assertThat(toCsv.out()).contains("effective-lifetime (µs), 7 x 5 pixels, copied from");
        Cli.Run toTif = Cli.run("convert", csv.toString(), "-o", back.toString());
        assertThat(toTif.err()).isEmpty();
        assertThat(toTif.code()).isZero();

        for (Path p : new Path[] {csv, back}) {
            WaferMap read = MapFiles.readSingle(p);
            assertThat(read.quantity()).as(p.toString()).isEqualTo(Quantity.EFFECTIVE_LIFETIME);
            assertThat(read.waferId()).as(p.toString()).isEqualTo("W-07");
            assertThat(read.width()).isEqualTo(7);
            assertThat(read.height()).isEqualTo(5);
            assertThat(read.raster().samples()).as(p.toString()).containsExactly(original.raster().samples());
            assertThat(read.grid().pitchMm()).as(p.toString()).isEqualTo(0.5);
            assertThat(read.conditions()).as(p.toString()).isEqualTo(c);
        }
    }

    @Test
    void aDensityWithoutADefectIsRefusedNamingTheDefectOption() throws Exception {
        Path tif = dir.resolve("w07.tif");
        MapFiles.write(map(Quantity.EFFECTIVE_LIFETIME, MeasurementConditions.UNKNOWN), tif);
        Path out = dir.resolve("nt.tif");
        Cli.Run r = Cli.run("convert", tif.toString(), "--quantity", "trap-density", "-o", out.toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).containsExactly("trapmap convert: --defect is required for --quantity trap-density:"
                + " a defect id (list them with 'trapmap defects'); only effective-lifetime or a plain format"
                + " conversion (no --quantity) needs none");
        assertThat(out).doesNotExist();
    }

    @Test
    void aLifetimeMapFromAPlImageNeedsNoDefect() throws Exception {
        MeasurementConditions c = new MeasurementConditions(Doping.pType(1e16), 180.0, null, null, 2e19, null, null,
                1e-27, Map.of());
        WaferMap pl = map(Quantity.PL_COUNTS, c);
        Path tif = dir.resolve("pl.tif");
        MapFiles.write(pl, tif);
        Path out = dir.resolve("tau.csv");
        JsonNode summary = Cli.json("convert", tif.toString(), "--quantity", "effective-lifetime", "-o",
                out.toString(), "--json");
        assertThat(summary.get("quantity").asText()).isEqualTo("effective-lifetime");
        assertThat(summary.get("defect").isNull()).isTrue();
        WaferMap tau = MapFiles.readSingle(out);
        WaferMap expected = MapConversion.lifetimeFromPl(MapFiles.readSingle(tif));
        assertThat(tau.quantity()).isEqualTo(Quantity.EFFECTIVE_LIFETIME);
        assertThat(tau.raster().get(4, 0)).isNaN();
        for (int i : new int[] {0, 5, 34}) {
            assertThat((double) tau.raster().samples()[i]).isCloseTo(expected.raster().samples()[i],
                    Percentage.withPercentage(1e-5)).isPositive();
        }
    }
}
