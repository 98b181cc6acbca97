package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.ByteArrayOutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.regex.Pattern;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;
import trapmap.maps.model.WaferMap;

/**
 * Damaged TIFF files must never read as maps: the demonstration wafer LOT-A01-W01 is re-encoded here in strips of 8
 * rows with each compression trapmap reads, and the lower half of its strips is damaged (cut short, pointing past
 * the end of the file, empty, or random bytes). Every such file must fail naming page, strip and byte counts; the
 * intact re-encodings must read as the original, pixel for pixel.
 */
class DamagedTiffTest {
    private static final Path ORIGINAL = Path.of("..", "demo-data", "LOT-A01-W01.tif");
    private static final int ROWS_PER_STRIP = 8;

    /** The compressions trapmap reads, with their TIFF codes and test-side encoders (no predictor). */
    enum Codec {
        NONE(1), DEFLATE(8), LZW(5), PACKBITS(32773);

        final int code;

        Codec(int code) {
            this.code = code;
        }

        byte[] encode(byte[] raw) {
            return switch (this) {
                case NONE -> raw;
                case DEFLATE -> TiffBytes.deflate(raw);
                case LZW -> lzw(raw);
                case PACKBITS -> packBits(raw);
            };
        }
    }

    @TempDir
    static Path dir;

    private static int width;
    private static int height;
    private static byte[] samples;
    private static String description;
    private static long[] resolution;
    private static WaferMap original;

    @BeforeAll
    static void readOriginal() throws Exception {
        byte[] b = Files.readAllBytes(ORIGINAL);
        ByteBuffer bb = ByteBuffer.wrap(b).order(ByteOrder.LITTLE_ENDIAN);
        assertThat(new String(b, 0, 2, StandardCharsets.US_ASCII)).isEqualTo("II");
        Map<Integer, int[]> tags = tags(b);
        width = tags.get(256)[2];
        height = tags.get(257)[2];
        assertThat(tags.get(259)[2]).as("the demonstration file is uncompressed").isEqualTo(1);
        assertThat(tags.get(273)[1]).as("in one strip").isEqualTo(1);
        samples = Arrays.copyOfRange(b, tags.get(273)[2], tags.get(273)[2] + 4 * width * height);
        description = new String(b, tags.get(270)[2], tags.get(270)[1] - 1, StandardCharsets.UTF_8);
        int r = tags.get(282)[2];
        resolution = new long[] {bb.getInt(r) & 0xFFFFFFFFL, bb.getInt(r + 4) & 0xFFFFFFFFL};
        Path copy = dir.resolve("original.tif"); // without the sidecar of demo-data/
        Files.copy(ORIGINAL, copy);
        original = MapFiles.readSingle(copy);
    }

    /** The entries of the first directory of a little-endian TIFF: tag → {type, count, value or offset}. */
    private static Map<Integer, int[]> tags(byte[] b) {
        ByteBuffer bb = ByteBuffer.wrap(b).order(ByteOrder.LITTLE_ENDIAN);
        int ifd = bb.getInt(4);
        Map<Integer, int[]> tags = new HashMap<>();
        for (int i = 0, n = bb.getShort(ifd); i < n; i++) {
            int p = ifd + 2 + 12 * i;
            tags.put(bb.getShort(p) & 0xFFFF, new int[] {bb.getShort(p + 2), bb.getInt(p + 4), bb.getInt(p + 8)});
        }
        return tags;
    }

    /** StripOffsets (LONG values) of the first directory. */
    private static long[] stripOffsets(byte[] b) {
        int[] e = tags(b).get(273);
        ByteBuffer bb = ByteBuffer.wrap(b).order(ByteOrder.LITTLE_ENDIAN);
        long[] out = new long[e[1]];
        for (int i = 0; i < out.length; i++) {
            out[i] = e[1] == 1 ? e[2] : bb.getInt(e[2] + 4 * i) & 0xFFFFFFFFL;
        }
        return out;
    }

    /** The strips of the original re-encoded: strip i holds rows [8i, 8i + 8). */
    private static List<byte[]> strips(Codec codec) {
        List<byte[]> out = new ArrayList<>();
        int rowBytes = 4 * width;
        for (int y = 0; y < height; y += ROWS_PER_STRIP) {
            int rows = Math.min(ROWS_PER_STRIP, height - y);
            out.add(codec.encode(Arrays.copyOfRange(samples, y * rowBytes, (y + rows) * rowBytes)));
        }
        return out;
    }

    private static Path write(String name, Codec codec, List<byte[]> strips) throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.page(width, height, 32, 3, codec.code).tag(278, TiffBytes.LONG, ROWS_PER_STRIP).ascii(270, description)
                .rational(282, resolution[0], resolution[1]).rational(283, resolution[0], resolution[1])
                .tag(296, TiffBytes.SHORT, 3).strips(strips.toArray(byte[][]::new));
        Path f = dir.resolve(name);
        Files.write(f, t.build());
        return f;
    }

    private static int stripCount() {
        return (height + ROWS_PER_STRIP - 1) / ROWS_PER_STRIP;
    }

    /** Where the first damaged strip is named: 1-based, of all. */
    private static String firstDamaged() {
        return "page 1 (directory at byte 8), strip " + (stripCount() / 2 + 1) + " of " + stripCount() + ": read error: ";
    }

    private static long stripBytes() {
        return 4L * width * ROWS_PER_STRIP;
    }

    @ParameterizedTest
    @EnumSource(Codec.class)
    void intactReEncodingReadsAsTheOriginalPixelForPixel(Codec codec) throws Exception {
        Path f = write("intact-" + codec + ".tif", codec, strips(codec));

        WaferMap m = MapFiles.readSingle(f);

        assertThat(height).isGreaterThan(2 * ROWS_PER_STRIP);
        assertThat(Fixtures.canonicalBits(m.raster().samples()))
                .isEqualTo(Fixtures.canonicalBits(original.raster().samples()));
        assertThat(m.grid()).isEqualTo(original.grid());
        assertThat(m.quantity()).isEqualTo(original.quantity());
    }

    @ParameterizedTest
    @EnumSource(Codec.class)
    void stripsCutShortAreAReadError(Codec codec) throws Exception {
        List<byte[]> s = strips(codec);
        int[] cutTo = new int[s.size()];
        for (int i = s.size() / 2; i < s.size(); i++) {
            cutTo[i] = s.get(i).length / 2;
            s.set(i, Arrays.copyOf(s.get(i), cutTo[i]));
        }
        Path f = write("short-" + codec + ".tif", codec, s);
        int first = s.size() / 2;

        String name = TiffHeader.compressionName(codec.code);
        String got = codec == Codec.NONE ? "got " + cutTo[first] + " bytes"
                : "(got \\d+ bytes after " + name + " decompression of its " + cutTo[first] + " bytes|the " + name
                + " data are corrupt \\(.+\\) after \\d+ decoded bytes)";
        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessageMatching(Pattern.quote(f + ": " + firstDamaged()) + got + ", expected " + stripBytes());
    }

    @ParameterizedTest
    @EnumSource(Codec.class)
    void stripsPastTheEndOfTheFileAreAReadError(Codec codec) throws Exception {
        List<byte[]> s = strips(codec);
        Path full = write("full-" + codec + ".tif", codec, s);
        byte[] b = Files.readAllBytes(full);
        long firstDamagedAt = stripOffsets(b)[s.size() / 2];
        int keep = (int) firstDamagedAt + 10; // ten bytes of the first damaged strip stay
        Path f = dir.resolve("cut-" + codec + ".tif");
        Files.write(f, Arrays.copyOf(b, keep));

        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessage(f + ": " + firstDamaged() + "got 10 of its " + s.get(s.size() / 2).length
                        + " bytes at byte " + firstDamagedAt + ", the file ends at byte " + keep
                        + "; the file is truncated");
    }

    @ParameterizedTest
    @EnumSource(Codec.class)
    void emptyStripsAreAReadError(Codec codec) throws Exception {
        List<byte[]> s = strips(codec);
        for (int i = s.size() / 2; i < s.size(); i++) {
            s.set(i, new byte[0]);
        }
        Path f = write("empty-" + codec + ".tif", codec, s);

        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessage(f + ": " + firstDamaged() + "got 0 bytes, expected " + stripBytes()
                        + " (its byte count is 0)");
    }

    @ParameterizedTest
    @EnumSource(value = Codec.class, names = {"DEFLATE", "LZW", "PACKBITS"})
    void randomBytesAsCompressedDataAreAReadError(Codec codec) throws Exception {
        List<byte[]> s = strips(codec);
        Random random = new Random(20_250_117L);
        for (int i = s.size() / 2; i < s.size(); i++) {
            random.nextBytes(s.get(i));
        }
        Path f = write("random-" + codec + ".tif", codec, s);

        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessageStartingWith(f + ": " + firstDamaged())
                .hasMessageEndingWith("expected " + stripBytes())
                .hasMessageNotContaining("Exception");
    }

    @Test
    void randomBytesAsUncompressedSamplesCannotBeToldFromSamples() throws Exception {
        // the only check on uncompressed data is their length: random bytes of the right length are read as floats
        List<byte[]> s = strips(Codec.NONE);
        Random random = new Random(7);
        for (int i = s.size() / 2; i < s.size(); i++) {
            random.nextBytes(s.get(i));
        }
        Path f = write("random-none.tif", Codec.NONE, s);

        float[] read = MapFiles.readSingle(f).raster().samples();

        int upper = width * ROWS_PER_STRIP * (s.size() / 2);
        assertThat(Fixtures.canonicalBits(Arrays.copyOf(read, upper)))
                .isEqualTo(Fixtures.canonicalBits(Arrays.copyOf(original.raster().samples(), upper)));
    }

    @Test
    void lastStripPaddedToFullRowsIsAccepted() throws Exception {
        // some writers store the last strip with all RowsPerStrip rows; the rows past the image are ignored
        int rows = height % ROWS_PER_STRIP;
        assertThat(rows).as("the demonstration map ends in a partial strip").isPositive();
        List<byte[]> s = new ArrayList<>();
        int rowBytes = 4 * width;
        for (int y = 0; y < height; y += ROWS_PER_STRIP) {
            byte[] raw = Arrays.copyOfRange(samples, y * rowBytes, Math.min(samples.length, (y + ROWS_PER_STRIP)
                    * rowBytes));
            s.add(TiffBytes.deflate(Arrays.copyOf(raw, ROWS_PER_STRIP * rowBytes)));
        }
        Path f = write("padded.tif", Codec.DEFLATE, s);

        assertThat(Fixtures.canonicalBits(MapFiles.readSingle(f).raster().samples()))
                .isEqualTo(Fixtures.canonicalBits(original.raster().samples()));
    }

    @Test
    void floatingPointPredictorPagesGoToTheSecondDecoderAndAreCheckedTheSame() throws Exception {
        // the JDK plugin cannot undo predictor 3, so these pages are decoded by TwelveMonkeys
        float[] raw = new float[width * height];
        ByteBuffer.wrap(samples).order(ByteOrder.LITTLE_ENDIAN).asFloatBuffer().get(raw);
        byte[] predicted = TiffBytes.floatingPointPredictor(raw, width, height);
        int rowBytes = 4 * width;
        List<byte[]> s = new ArrayList<>();
        for (int y = 0; y < height; y += ROWS_PER_STRIP) {
            int rows = Math.min(ROWS_PER_STRIP, height - y);
            s.add(TiffBytes.deflate(Arrays.copyOfRange(predicted, y * rowBytes, (y + rows) * rowBytes)));
        }
        TiffBytes t = TiffBytes.littleEndian();
        t.page(width, height, 32, 3, 8).tag(278, TiffBytes.LONG, ROWS_PER_STRIP).tag(317, TiffBytes.SHORT, 3)
                .strips(s.toArray(byte[][]::new));
        Path intact = dir.resolve("predictor3.tif"); // no metadata: the provenance names the decoder
        Files.write(intact, t.build());
        WaferMap m = MapFiles.readSingle(intact);
        assertThat(Fixtures.canonicalBits(m.raster().samples())).isEqualTo(Fixtures.canonicalBits(raw));
        assertThat(m.provenance().steps().get(0).parameters()).containsEntry("decoder", "twelvemonkeys");

        s.set(s.size() / 2, Arrays.copyOf(s.get(s.size() / 2), s.get(s.size() / 2).length / 2));
        TiffBytes cut = TiffBytes.littleEndian();
        cut.page(width, height, 32, 3, 8).tag(278, TiffBytes.LONG, ROWS_PER_STRIP).tag(317, TiffBytes.SHORT, 3)
                .strips(s.toArray(byte[][]::new));
        Path f = dir.resolve("predictor3-short.tif");
        Files.write(f, cut.build());
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessageStartingWith(f + ": " + firstDamaged() + "got ")
                .hasMessageEndingWith("expected " + stripBytes());
    }

    @Test
    void lzwCodeBeforeItsDefinitionIsNamedNotAJdkException() throws Exception {
        // after the clear code 256 the first code must be a literal; 300 is undefined (the JDK plugin would fail
        // with a NullPointerException)
        byte[] data = bits9(256, 300, 257);
        TiffBytes t = TiffBytes.littleEndian();
        t.page(4, 4, 8, 1, 5).strips(data);
        Path f = dir.resolve("lzw-bad.tif");
        Files.write(f, t.build());

        assertThatThrownBy(() -> MapFiles.read(f)).hasMessage(f + ": page 1 (directory at byte 8), strip 1 of 1:"
                + " read error: the LZW data are corrupt (code 300 where a literal byte must follow a clear code)"
                + " after 0 decoded bytes, expected 16");
    }

    @Test
    void oldBitReversedLzwIsCheckedToo() throws Exception {
        // TIFF 5.0 LZW: codes least significant bit first, widths grow at 512, 1024, 2048; the JDK plugin refuses it
        // and TwelveMonkeys decodes it
        List<byte[]> s = new ArrayList<>();
        int rowBytes = 4 * width;
        for (int y = 0; y < height; y += ROWS_PER_STRIP) {
            int rows = Math.min(ROWS_PER_STRIP, height - y);
            s.add(oldLzw(Arrays.copyOfRange(samples, y * rowBytes, (y + rows) * rowBytes)));
        }
        assertThat(s.get(0)[0]).isZero();
        Path intact = write("old-lzw.tif", Codec.LZW, s);
        WaferMap m = MapFiles.readSingle(intact);
        assertThat(Fixtures.canonicalBits(m.raster().samples()))
                .isEqualTo(Fixtures.canonicalBits(original.raster().samples()));

        int first = s.size() / 2;
        s.set(first, Arrays.copyOf(s.get(first), s.get(first).length / 2));
        Path f = write("old-lzw-short.tif", Codec.LZW, s);
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessageMatching(Pattern.quote(f + ": " + firstDamaged())
                + "got \\d+ bytes after LZW decompression of its " + s.get(first).length + " bytes, expected "
                + stripBytes());
    }

    @Test
    void damagedTileIsNamed() throws Exception {
        // a 32 × 32 map in four 16 × 16 tiles, Deflate; tile 2 cut to half
        int w = 32;
        float[] v = new float[w * w];
        for (int i = 0; i < v.length; i++) {
            v[i] = 10 + i % 97;
        }
        List<byte[]> tiles = new ArrayList<>();
        for (int ty = 0; ty < 2; ty++) {
            for (int tx = 0; tx < 2; tx++) {
                float[] tile = new float[256];
                for (int y = 0; y < 16; y++) {
                    System.arraycopy(v, (ty * 16 + y) * w + tx * 16, tile, y * 16, 16);
                }
                tiles.add(TiffBytes.deflate(TiffBytes.littleEndian().floats(tile)));
            }
        }
        Path intact = dir.resolve("tiles.tif");
        Files.write(intact, tiled(w, tiles));
        assertThat(MapFiles.readSingle(intact).raster().samples()).containsExactly(v);

        tiles.set(1, Arrays.copyOf(tiles.get(1), tiles.get(1).length / 2));
        Path f = dir.resolve("tiles-short.tif");
        Files.write(f, tiled(w, tiles));
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessageStartingWith(f + ": page 1 (directory at byte 8), tile"
                + " 2 of 4: read error: got ").hasMessageEndingWith("expected 1024");
    }

    /** A tiled page (tiles of 16 × 16) with TileOffsets/TileByteCounts filled in. */
    private static byte[] tiled(int size, List<byte[]> tiles) {
        // StripOffsets-style auto placement is only for strips: place the tiles by hand after a fixed header
        TiffBytes probe = TiffBytes.littleEndian();
        probe.page(size, size, 32, 3, 8).remove(278).tag(322, TiffBytes.LONG, 16).tag(323, TiffBytes.LONG, 16)
                .tag(324, TiffBytes.LONG, 0, 0, 0, 0).tag(325, TiffBytes.LONG, 0, 0, 0, 0).manualStrips();
        int headerLength = probe.build().length;
        long[] offsets = new long[tiles.size()];
        long[] counts = new long[tiles.size()];
        long at = headerLength;
        ByteArrayOutputStream data = new ByteArrayOutputStream();
        for (int i = 0; i < tiles.size(); i++) {
            offsets[i] = at;
            counts[i] = tiles.get(i).length;
            data.writeBytes(tiles.get(i));
            at += tiles.get(i).length;
        }
        TiffBytes t = TiffBytes.littleEndian();
        t.page(size, size, 32, 3, 8).remove(278).tag(322, TiffBytes.LONG, 16).tag(323, TiffBytes.LONG, 16)
                .tag(324, TiffBytes.LONG, offsets).tag(325, TiffBytes.LONG, counts).manualStrips();
        byte[] head = t.build();
        assertThat(head.length).isEqualTo(headerLength);
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        out.writeBytes(head);
        out.writeBytes(data.toByteArray());
        return out.toByteArray();
    }

    // ------------------------------------------------------------------------- test-side encoders (TIFF 6.0)

    /** 9-bit codes, most significant bit first. */
    private static byte[] bits9(int... codes) {
        BitWriter w = new BitWriter(true);
        for (int c : codes) {
            w.write(c, 9);
        }
        return w.finish();
    }

    /** Codes packed into bytes, most significant bit first (TIFF 6.0) or least significant first (TIFF 5.0). */
    private static final class BitWriter {
        private final ByteArrayOutputStream out = new ByteArrayOutputStream();
        private final boolean msbFirst;
        private long bits;
        private int have;

        BitWriter(boolean msbFirst) {
            this.msbFirst = msbFirst;
        }

        void write(int code, int width) {
            bits = msbFirst ? bits << width | code : bits | (long) code << have;
            have += width;
            while (have >= 8) {
                if (msbFirst) {
                    out.write((int) (bits >>> (have - 8)));
                } else {
                    out.write((int) (bits & 0xFF));
                    bits >>>= 8;
                }
                have -= 8;
            }
        }

        byte[] finish() {
            if (have > 0) {
                out.write((int) (msbFirst ? bits << (8 - have) : bits & 0xFF));
            }
            return out.toByteArray();
        }
    }

    /**
     * TIFF LZW (section 13): clear code first, codes 9 to 12 bits wide, the width grows once the table's next code
     * passes 511, 1023 and 2047 (one code early, as libtiff writes), a clear code when the table reaches 4094.
     */
    static byte[] lzw(byte[] data) {
        return lzw(data, true);
    }

    /** The TIFF 5.0 variant of {@link #lzw}: codes least significant bit first, no early change of width. */
    static byte[] oldLzw(byte[] data) {
        return lzw(data, false);
    }

    private static byte[] lzw(byte[] data, boolean tiff6) {
        BitWriter w = new BitWriter(tiff6);
        int early = tiff6 ? 1 : 0;
        int width = 9;
        w.write(256, width);
        Map<Integer, Integer> table = new HashMap<>();
        int next = 258;
        int prefix = -1;
        for (byte value : data) {
            int b = value & 0xFF;
            if (prefix < 0) {
                prefix = b;
                continue;
            }
            Integer code = table.get(prefix << 8 | b);
            if (code != null) {
                prefix = code;
                continue;
            }
            w.write(prefix, width);
            table.put(prefix << 8 | b, next++);
            if (next > (1 << width) - early && width < 12) {
                width++;
            }
            if (next == 4094) {
                w.write(256, width);
                table.clear();
                next = 258;
                width = 9;
            }
            prefix = b;
        }
        if (prefix >= 0) {
            w.write(prefix, width);
        }
        w.write(257, width);
        return w.finish();
    }

    /** PackBits (section 9): runs of 3 to 128 equal bytes as (1 − n, byte), the rest as literal runs of up to 128. */
    static byte[] packBits(byte[] data) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int i = 0;
        while (i < data.length) {
            int run = 1;
            while (i + run < data.length && run < 128 && data[i + run] == data[i]) {
                run++;
            }
            if (run >= 3) {
                out.write(1 - run);
                out.write(data[i]);
                i += run;
                continue;
            }
            int j = i;
            while (j < data.length && j - i < 128
                    && !(j + 2 < data.length && data[j] == data[j + 1] && data[j] == data[j + 2])) {
                j++;
            }
            out.write(j - i - 1);
            out.write(data, i, j - i);
            i = j;
        }
        return out.toByteArray();
    }
}
