package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;

class UnitsTest {
    @TempDir
    Path dir;

    private Path tiff(String name, float... samples) throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.floatPage(samples.length, 1, samples);
        Path f = dir.resolve(name + ".tif");
        Files.write(f, t.build());
        return f;
    }

    private void sidecar(String name, String json) throws Exception {
        Files.writeString(dir.resolve(name + ".json"), json);
    }

    @ParameterizedTest
    @CsvSource({"s, 1e6", "ms, 1e3", "us, 1", "µs, 1", "ns, 1e-3", "seconds, 1e6", "NS, 1e-3"})
    void lifetimesAreConvertedToMicroseconds(String unit, double factor) throws Exception {
        Path f = tiff("t", 2.5f, 40f, Float.NaN);
        sidecar("t", "{\"unit\": \"" + unit + "\", \"pixel_pitch_mm\": 1}");

        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.quantity()).isEqualTo(Quantity.EFFECTIVE_LIFETIME);
        assertThat(m.raster().samples()).containsExactly((float) (2.5f * factor), (float) (40f * factor), Float.NaN);
        if (factor != 1) {
            assertThat(m.provenance().steps()).last().satisfies(st -> {
                assertThat(st.operation()).isEqualTo("convert-unit");
                assertThat(st.parameters()).containsEntry("to", "µs");
            });
        } else {
            assertThat(m.provenance().steps()).extracting(ProcessingStep::operation).containsExactly("read",
                    "sidecar");
        }
    }

    @Test
    void missingUnitIsAssumedMicrosecondsAndSaidSo() throws Exception {
        Path f = tiff("n", 12f);
        sidecar("n", "{\"quantity\": \"effective-lifetime\", \"pixel_pitch_mm\": 1}");

        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.raster().samples()).containsExactly(12f);
        assertThat(m.provenance().steps()).last().isEqualTo(ProcessingStep.of("assume", "note", "unit assumed: µs"));
    }

    @Test
    void otherLifetimeQuantitiesAreConvertedToo() throws Exception {
        Path f = tiff("srh", 0.002f);
        sidecar("srh", "{\"quantity\": \"srh-lifetime\", \"unit\": \"ms\"}");
        assertThat(MapFiles.readSingle(f).raster().samples()).containsExactly(2f);
    }

    @Test
    void aLifetimeUnitAloneMeansEffectiveLifetime() throws Exception {
        Path f = tiff("u", 1f);
        sidecar("u", "{\"unit\": \"ms\"}");
        assertThat(MapFiles.readSingle(f).quantity()).isEqualTo(Quantity.EFFECTIVE_LIFETIME);
    }

    @Test
    void countsUnitMeansPlCounts() throws Exception {
        Path f = tiff("c", 1000f);
        sidecar("c", "{\"unit\": \"counts\"}");
        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.quantity()).isEqualTo(Quantity.PL_COUNTS);
        assertThat(m.raster().samples()).containsExactly(1000f);
    }

    @Test
    void unknownLifetimeUnitIsRefused() throws Exception {
        Path f = tiff("bad", 1f);
        sidecar("bad", "{\"quantity\": \"effective-lifetime\", \"unit\": \"min\"}");
        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessage(dir.resolve("bad.json") + ": field 'unit': 'min' is not a lifetime unit, but the quantity"
                        + " is effective-lifetime (expected s, ms, us/µs or ns)");
    }

    @Test
    void unitMustFitTheQuantity() throws Exception {
        Path f = tiff("q", 1f);
        sidecar("q", "{\"quantity\": \"trap-density\", \"unit\": \"us\"}");
        assertThatThrownBy(() -> MapFiles.read(f))
                .hasMessage(dir.resolve("q.json") + ": field 'unit': 'us' does not fit quantity trap-density"
                        + " (expected 'cm^-3')");
    }

    @Test
    void densityUnitsMayBeSpelledInSeveralWays() throws Exception {
        Path f = tiff("d", 1e12f);
        sidecar("d", "{\"quantity\": \"trap-density\", \"unit\": \"cm-3\"}");
        assertThat(MapFiles.readSingle(f).quantity()).isEqualTo(Quantity.TRAP_DENSITY);
    }

    @Test
    void unitWithoutQuantityThatIsNoLifetimeIsRefused() throws Exception {
        Path f = tiff("cm", 1f);
        sidecar("cm", "{\"unit\": \"cm^-3\"}");
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessageContaining("field 'unit': unit 'cm^-3' alone does not"
                + " say what the map holds");
    }

    @Test
    void conversionBeyondTheFloatRangeIsRefused() throws Exception {
        Path f = tiff("huge", 1e35f);
        sidecar("huge", "{\"unit\": \"s\"}");
        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessage(f + ": row 1, column 1: converting s to µs gives a value beyond the 32-bit float range;"
                        + " check field 'unit'");
    }

    @Test
    void csvGridInSecondsIsConvertedFromTheDecimalText() throws Exception {
        Path f = dir.resolve("g.csv");
        Files.writeString(f, "# unit=s\n0.001,2.5e-5\n");
        assertThat(MapFiles.readSingle(f).raster().samples()).containsExactly(1000f, 25f);
    }
}
