package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.function.Function;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.model.WaferMap;

/**
 * Robustness of the readers against damaged input: valid small TIFF, CSV and sidecar files are mutated thousands of
 * times (seeded, so every run sees the same mutants) by bit flips, byte insertions and deletions, truncation at every
 * length, huge numbers and tampered TIFF header fields. Every read must either succeed or fail with a one-line
 * {@link MapFormatException} naming the file — never another exception, a hang or running out of memory.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class MapFilesFuzzTest {
    private static final long SEED = 20240611L;
    private static final int BATCH = 250;
    /** A small pixel limit keeps each mutant cheap; the limit logic is the same as with the default. */
    private static final ReadOptions OPTIONS = ReadOptions.DEFAULTS.withMaxPixels(1 << 20)
            .withCsvResampling(ReadOptions.Resampling.OFF);

    @TempDir
    Path dir;

    private final Map<String, int[]> tally = new LinkedHashMap<>();
    private int total;

    private static final byte[] TOKENS_TEXT = ",;\"#\n\r\t{}[]:.-+eE0123456789 nNaA_xyvalue".getBytes(
            StandardCharsets.US_ASCII);

    @BeforeAll
    void start() {
        total = 0;
    }

    @AfterAll
    void report() {
        StringBuilder s = new StringBuilder("fuzz: " + total + " mutants (read ok / refused):");
        tally.forEach((k, v) -> s.append(' ').append(k).append('=').append(v[0]).append('/').append(v[1]));
        System.out.println(s);
        assertThat(total).isGreaterThanOrEqualTo(3000);
    }

    // ------------------------------------------------------------------------------------------------- seeds

    private byte[] written(WaferMap m, String name, WriteOptions o) throws IOException {
        Path f = dir.resolve("seed-" + name);
        MapFiles.write(m, f, o);
        return Files.readAllBytes(f);
    }

    private static byte[] tinyTiff() {
        TiffBytes t = TiffBytes.littleEndian();
        t.floatPage(3, 2, new float[] {1, 2, Float.NaN, 4, 5, 6}).rational(282, 20, 1).tag(296, TiffBytes.SHORT, 3);
        return t.build();
    }

    private static byte[] predictorTiff() {
        float[] s = Fixtures.lifetimes(8, 6, 3);
        TiffBytes t = TiffBytes.littleEndian();
        t.page(8, 6, 32, 3, 8).tag(317, TiffBytes.SHORT, 3).tag(278, TiffBytes.LONG, 3)
                .strips(TiffBytes.deflate(Arrays.copyOfRange(TiffBytes.floatingPointPredictor(s, 8, 6), 0, 96)),
                        TiffBytes.deflate(Arrays.copyOfRange(TiffBytes.floatingPointPredictor(s, 8, 6), 96, 192)));
        return t.build();
    }

    private static byte[] u16Tiff() {
        TiffBytes t = TiffBytes.bigEndian();
        int[] raw = new int[5 * 4];
        for (int i = 0; i < raw.length; i++) {
            raw[i] = i * 3000;
        }
        t.page(5, 4, 16, 1, 1).strips(t.ushorts(raw)).ascii(270, "{\"quantity\": \"effective-lifetime\","
                + " \"unit\": \"ms\", \"scale\": 0.001, \"no_data\": 0, \"pixel_pitch_mm\": 0.5}");
        return t.build();
    }

    private static final String CSV_POINTS = "# unit=us\n# wafer_id=F1\nx_mm,y_mm,value\n-1,1,10\n0,1,20\n1,1,30\n"
            + "-1,0,40\n0,0,50\n1,0,NaN\n-1,-1,70\n0,-1,80\n";
    private static final String CSV_GRID = "# pixel_pitch_mm=0.5\n# doping=p:1e16\n1,2,3,4\n5,,7,8\n9,10,11,NaN\n";
    private static final String SIDECAR = "{\"wafer_id\": \"w\", \"quantity\": \"effective-lifetime\", \"unit\": \"ms\","
            + " \"pixel_pitch_mm\": 0.5, \"centre_x_px\": 1, \"centre_y_px\": 0.5, \"pages\": [\"before\"],"
            + " \"conditions\": {\"doping\": \"p:1.5ohmcm\", \"thickness_um\": 180, \"injection_cm3\": 1e14,"
            + " \"srv_cm_s\": 10, \"note\": \"x\"}}";

    // ------------------------------------------------------------------------------------------------- tests

    @Test
    void damagedTiffFilesAreReadOrRefusedCleanly() throws Exception {
        WaferMap small = Fixtures.lifetimeMap(6, 5, 1);
        byte[] fast = written(small, "fast.tif", WriteOptions.DEFAULTS);
        byte[] deflate = written(small, "deflate.tif", WriteOptions.DEFAULTS.withTiffCompression(
                WriteOptions.TiffCompression.DEFLATE));
        byte[] lzw = written(Fixtures.lifetimeMap(12, 9, 2), "lzw.tif", WriteOptions.DEFAULTS.withTiffCompression(
                WriteOptions.TiffCompression.LZW));
        Path pair = dir.resolve("seed-pair.tif");
        MapFiles.writeAll(List.of(small, Fixtures.lifetimeMap(4, 3, 9)), pair, WriteOptions.DEFAULTS
                .withTiffCompression(WriteOptions.TiffCompression.PACKBITS));
        byte[] multi = Files.readAllBytes(pair);

        Random r = new Random(SEED);
        run("tiff-fast", "m.tif", mutants(fast, 500, r, this::binary));
        run("tiff-deflate", "m.tif", mutants(deflate, 400, r, this::binary));
        run("tiff-lzw", "m.tif", mutants(lzw, 300, r, this::binary));
        run("tiff-multipage", "m.tif", mutants(multi, 250, r, this::binary));
        run("tiff-predictor3", "m.tif", mutants(predictorTiff(), 300, r, this::binary));
        run("tiff-16bit", "m.tif", mutants(u16Tiff(), 250, r, this::binary));
    }

    @Test
    void tiffTruncatedAtEveryLengthAndWithTamperedHeaderFields() throws Exception {
        byte[] tiny = tinyTiff();
        List<byte[]> cuts = new ArrayList<>();
        for (int len = 0; len < tiny.length; len++) {
            cuts.add(Arrays.copyOf(tiny, len));
        }
        run("tiff-truncated", "t.tif", cuts);
        Random r = new Random(SEED + 1);
        List<byte[]> tampered = new ArrayList<>();
        for (int i = 0; i < 600; i++) {
            tampered.add(tamper(tiny, r));
        }
        run("tiff-header", "t.tif", tampered);
        byte[] u16 = u16Tiff();
        List<byte[]> tampered16 = new ArrayList<>();
        for (int i = 0; i < 200; i++) {
            tampered16.add(tamper(u16, r));
        }
        run("tiff-header-16bit", "t.tif", tampered16);
    }

    @Test
    void damagedCsvFilesAreReadOrRefusedCleanly() throws Exception {
        Random r = new Random(SEED + 2);
        byte[] points = CSV_POINTS.getBytes(StandardCharsets.UTF_8);
        byte[] grid = CSV_GRID.getBytes(StandardCharsets.UTF_8);
        run("csv-points", "m.csv", mutants(points, 450, r, this::text));
        run("csv-grid", "m.csv", mutants(grid, 350, r, this::text));
        List<byte[]> cuts = new ArrayList<>();
        for (int len = 1; len < points.length; len++) {
            cuts.add(Arrays.copyOf(points, len));
        }
        run("csv-truncated", "m.csv", cuts);
    }

    @Test
    void damagedSidecarsAreReadOrRefusedCleanly() throws Exception {
        Files.write(dir.resolve("s.tif"), tinyTiff());
        Random r = new Random(SEED + 3);
        byte[] json = SIDECAR.getBytes(StandardCharsets.UTF_8);
        List<byte[]> all = new ArrayList<>(mutants(json, 600, r, this::text));
        for (int len = 0; len < json.length; len++) {
            all.add(Arrays.copyOf(json, len));
        }
        runWithSidecar("sidecar", all);
    }

    // ------------------------------------------------------------------------------------------------- harness

    private void run(String kind, String fileName, List<byte[]> mutants) throws Exception {
        Path f = dir.resolve(fileName);
        Files.deleteIfExists(MapFiles.sidecarOf(f));
        runBatches(kind, mutants, bytes -> {
            Files.write(f, bytes);
            return f;
        }, f);
    }

    private void runWithSidecar(String kind, List<byte[]> mutants) throws Exception {
        Path map = dir.resolve("s.tif");
        Path json = dir.resolve("s.json");
        runBatches(kind, mutants, bytes -> {
            Files.write(json, bytes);
            return map;
        }, map);
    }

    private interface Writer {
        Path write(byte[] bytes) throws IOException;
    }

    private void runBatches(String kind, List<byte[]> mutants, Writer writer, Path shown) throws Exception {
        int[] counts = tally.computeIfAbsent(kind, k -> new int[2]);
        for (int from = 0; from < mutants.size(); from += BATCH) {
            List<byte[]> batch = mutants.subList(from, Math.min(mutants.size(), from + BATCH));
            int first = from;
            assertTimeoutPreemptively(Duration.ofSeconds(60), () -> {
                for (int i = 0; i < batch.size(); i++) {
                    byte[] bytes = batch.get(i);
                    Path file = writer.write(bytes);
                    try {
                        List<WaferMap> maps = MapFiles.read(file, OPTIONS);
                        assertThat(maps).isNotEmpty();
                        counts[0]++;
                    } catch (MapFormatException e) {
                        String m = e.getMessage();
                        if (!m.startsWith(dir.toString()) || m.contains("\n")
                                || e.problem().startsWith("unexpected failure while reading")) {
                            keep(kind, first + i, bytes);
                            fail(kind + " mutant " + (first + i) + ": unclear message: " + m, e);
                        }
                        counts[1]++;
                    } catch (Throwable t) {
                        keep(kind, first + i, bytes);
                        fail(kind + " mutant " + (first + i) + " of " + shown.getFileName() + " threw " + t, t);
                    }
                    total++;
                }
            }, kind + " batch from mutant " + first);
        }
    }

    /** Keeps a failing mutant under target/ for reproduction. */
    private static void keep(String kind, int index, byte[] bytes) {
        try {
            Path out = Path.of("target", "fuzz-failures");
            Files.createDirectories(out);
            Files.write(out.resolve(kind + "-" + index + ".bin"), bytes);
        } catch (IOException ignored) {
            // reporting only
        }
    }

    // ------------------------------------------------------------------------------------------------- mutations

    private static List<byte[]> mutants(byte[] seed, int n, Random r, Function<MutationInput, byte[]> mutate) {
        List<byte[]> out = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            out.add(mutate.apply(new MutationInput(seed, r)));
        }
        return out;
    }

    private record MutationInput(byte[] seed, Random r) {
    }

    /** One to three random mutations of a binary file. */
    private byte[] binary(MutationInput in) {
        byte[] b = in.seed().clone();
        Random r = in.r();
        int rounds = 1 + r.nextInt(3);
        for (int k = 0; k < rounds; k++) {
            switch (r.nextInt(7)) {
                case 0 -> flipBits(b, r);
                case 1 -> b = insert(b, r, randomBytes(r, 1 + r.nextInt(4)));
                case 2 -> b = delete(b, r);
                case 3 -> b = Arrays.copyOf(b, r.nextInt(b.length + 1));
                case 4 -> hugeNumber(b, r);
                case 5 -> b = tamper(b, r);
                default -> b[r.nextInt(b.length == 0 ? 1 : b.length) % Math.max(1, b.length)] ^= (byte) 0xFF;
            }
            if (b.length == 0) {
                break;
            }
        }
        return b;
    }

    /** One to three random mutations of a text file. */
    private byte[] text(MutationInput in) {
        byte[] b = in.seed().clone();
        Random r = in.r();
        int rounds = 1 + r.nextInt(3);
        for (int k = 0; k < rounds; k++) {
            switch (r.nextInt(7)) {
                case 0 -> flipBits(b, r);
                case 1 -> b = insert(b, r, new byte[] {TOKENS_TEXT[r.nextInt(TOKENS_TEXT.length)]});
                case 2 -> b = delete(b, r);
                case 3 -> b = Arrays.copyOf(b, r.nextInt(b.length + 1));
                case 4 -> b = insert(b, r, hugeText(r));
                case 5 -> b = replaceNumber(b, r);
                default -> {
                    if (b.length > 0) {
                        b[r.nextInt(b.length)] = TOKENS_TEXT[r.nextInt(TOKENS_TEXT.length)];
                    }
                }
            }
        }
        return b;
    }

    private static void flipBits(byte[] b, Random r) {
        if (b.length == 0) {
            return;
        }
        int n = 1 + r.nextInt(8);
        for (int i = 0; i < n; i++) {
            b[r.nextInt(b.length)] ^= (byte) (1 << r.nextInt(8));
        }
    }

    private static byte[] insert(byte[] b, Random r, byte[] what) {
        int at = r.nextInt(b.length + 1);
        byte[] out = new byte[b.length + what.length];
        System.arraycopy(b, 0, out, 0, at);
        System.arraycopy(what, 0, out, at, what.length);
        System.arraycopy(b, at, out, at + what.length, b.length - at);
        return out;
    }

    private static byte[] delete(byte[] b, Random r) {
        if (b.length == 0) {
            return b;
        }
        int at = r.nextInt(b.length);
        int len = 1 + r.nextInt(Math.min(16, b.length - at));
        byte[] out = new byte[b.length - len];
        System.arraycopy(b, 0, out, 0, at);
        System.arraycopy(b, at + len, out, at, b.length - at - len);
        return out;
    }

    private static byte[] randomBytes(Random r, int n) {
        byte[] x = new byte[n];
        r.nextBytes(x);
        return x;
    }

    private static final long[] HUGE = {0xFFFFFFFFL, 0x7FFFFFFFL, 0x80000000L, 0x10000L, 0xFFFFL, 65536L * 65536L - 2,
        100_000L, 0};

    /** Overwrites an aligned 16- or 32-bit field with an extreme value. */
    private static void hugeNumber(byte[] b, Random r) {
        if (b.length < 4) {
            return;
        }
        int at = r.nextInt(b.length - 3) & ~1;
        long v = HUGE[r.nextInt(HUGE.length)];
        ByteBuffer bb = ByteBuffer.wrap(b).order(b[0] == 'M' ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN);
        if (r.nextBoolean()) {
            bb.putInt(at, (int) v);
        } else {
            bb.putShort(at, (short) v);
        }
    }

    /** Sets the tag, type, count or value of a random entry of the first directory (or the IFD links) to extremes. */
    private static byte[] tamper(byte[] seed, Random r) {
        byte[] b = seed.clone();
        if (b.length < 8) {
            return b;
        }
        ByteBuffer bb = ByteBuffer.wrap(b).order(b[0] == 'M' ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN);
        long ifd = bb.getInt(4) & 0xFFFFFFFFL;
        if (ifd + 2 > b.length) {
            return b;
        }
        int n = bb.getShort((int) ifd) & 0xFFFF;
        int choice = r.nextInt(10);
        if (choice == 0) {
            bb.putInt(4, (int) HUGE[r.nextInt(HUGE.length)]);
            return b;
        }
        if (choice == 1) {
            bb.putShort((int) ifd, (short) (r.nextBoolean() ? 0xFFFF : n + 1 + r.nextInt(3)));
            return b;
        }
        if (n == 0 || ifd + 2 + 12L * n + 4 > b.length) {
            return b;
        }
        if (choice == 2) {
            bb.putInt((int) (ifd + 2 + 12L * n), (int) (r.nextBoolean() ? ifd : HUGE[r.nextInt(HUGE.length)]));
            return b;
        }
        int e = (int) (ifd + 2 + 12L * r.nextInt(n));
        switch (choice) {
            case 3 -> bb.putShort(e, (short) new int[] {256, 257, 258, 259, 273, 277, 278, 279, 317, 322, 339, 0, 65535}
                    [r.nextInt(13)]);
            case 4 -> bb.putShort(e + 2, (short) new int[] {0, 1, 2, 3, 4, 5, 7, 11, 12, 13, 16, 99, 0xFFFF}
                    [r.nextInt(13)]);
            case 5, 6 -> bb.putInt(e + 4, (int) new long[] {0, 1, 2, 3, 0x7FFFFFFFL, 0xFFFFFFFFL, 1 << 20, b.length}
                    [r.nextInt(8)]);
            default -> bb.putInt(e + 8, (int) (r.nextInt(4) == 0 ? r.nextInt() : HUGE[r.nextInt(HUGE.length)]));
        }
        return b;
    }

    private static byte[] hugeText(Random r) {
        String[] s = {"1e309", "-1e400", "99999999999999999999999999", "1e-400", "NaN", "Infinity", "0x1p3",
            "1e99999999999", "\u00b5", "\uFEFF", "\"", "#", "1,5", ";", "\n\n", "1.5.5", "--1", "1e", ".", "\u0000",
            "{\"a\":[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]}"};
        byte[] x = s[r.nextInt(s.length)].getBytes(StandardCharsets.UTF_8);
        if (r.nextInt(10) == 0) {
            return new byte[] {(byte) 0xC3}; // a broken UTF-8 sequence
        }
        return x;
    }

    /** Replaces the digits of a random number with an extreme value. */
    private static byte[] replaceNumber(byte[] b, Random r) {
        String s = new String(b, StandardCharsets.ISO_8859_1);
        List<int[]> spans = new ArrayList<>();
        java.util.regex.Matcher m = java.util.regex.Pattern.compile("-?\\d+(\\.\\d+)?([eE][+-]?\\d+)?").matcher(s);
        while (m.find()) {
            spans.add(new int[] {m.start(), m.end()});
        }
        if (spans.isEmpty()) {
            return b;
        }
        int[] sp = spans.get(r.nextInt(spans.size()));
        String[] repl = {"1e308", "-1e308", "1e39", "4294967295", "2147483648", "100000", "-0", "0", "1e-45",
            "123456789012345678901234567890", "1e6", "-1e6", "1000001"};
        String out = s.substring(0, sp[0]) + repl[r.nextInt(repl.length)] + s.substring(sp[1]);
        return out.getBytes(StandardCharsets.ISO_8859_1);
    }
}
