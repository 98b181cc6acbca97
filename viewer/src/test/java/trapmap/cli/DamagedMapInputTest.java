package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.WriteOptions;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

/** The map commands on damaged or odd inputs: exit code 2 and the reader's one-line message. */
class DamagedMapInputTest {
    @TempDir
    Path dir;

    /** A 64 × 64 lifetime map written with Deflate, then its last strip's byte count halved. */
    private Path shortDeflateStrip() throws Exception {
        int n = 64;
        float[] s = new float[n * n];
        for (int i = 0; i < s.length; i++) {
            s[i] = 50 + (i * 37 % 101);
        }
        WaferMap m = new WaferMap(FloatRaster.wrap(n, n, s), PixelGrid.centred(n, n, 2.0),
                Quantity.EFFECTIVE_LIFETIME, "w", MeasurementConditions.UNKNOWN, Provenance.of("test"));
        Path f = dir.resolve("w.tif");
        MapFiles.write(m, f, WriteOptions.DEFAULTS.withTiffCompression(WriteOptions.TiffCompression.DEFLATE));
        byte[] b = Files.readAllBytes(f);
        ByteBuffer bb = ByteBuffer.wrap(b).order(b[0] == 'I' ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN);
        int ifd = bb.getInt(4);
        for (int i = 0, entries = bb.getShort(ifd); i < entries; i++) {
            int p = ifd + 2 + 12 * i;
            if ((bb.getShort(p) & 0xFFFF) == 279) {
                int count = bb.getInt(p + 4);
                int last = count == 1 ? p + 8 : bb.getInt(p + 8) + 4 * (count - 1);
                assertThat(bb.getShort(p + 2)).as("StripByteCounts of type LONG").isEqualTo((short) 4);
                bb.putInt(last, bb.getInt(last) / 2);
            }
        }
        Files.write(f, b);
        return f;
    }

    @Test
    void statsOnAShortStripExitsTwoWithTheReadError() throws Exception {
        Path f = shortDeflateStrip();
        Cli.Run r = Cli.run("stats", f.toString(), "--json");
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.out()).isEmpty();
        assertThat(r.errLines()).hasSize(1).first().asString().contains(f.toString()).contains("page 1")
                .containsPattern("strip \\d+ of \\d+: read error: got \\d+ bytes after Deflate decompression of its"
                        + " \\d+ bytes, expected \\d+");
    }

    @Test
    @Timeout(value = 30, unit = TimeUnit.SECONDS)
    void statsOnAFifoSaysNotARegularFile() throws Exception {
        Path f = Fifo.make(dir.resolve("pipe.tif"));
        Cli.Run r = Cli.run("stats", f.toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).containsExactly("trapmap stats: " + f + ": is a FIFO, socket or device, not a"
                + " regular file");
    }
}
