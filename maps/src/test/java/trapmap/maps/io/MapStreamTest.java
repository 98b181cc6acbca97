package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import trapmap.maps.model.MapHeader;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.BandConversion;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.process.WarmUpThreads;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.shared.progress.HeadStart;

/**
 * Band-wise reading ({@link MapStream}), conversion ({@link BandConversion}) and writing ({@link TiffRowWriter})
 * against the whole-map path: {@link MapFiles#read}, {@link MapConversion#convert} and {@link MapFiles#write} must
 * give the same samples, figures and file bytes.
 */
class MapStreamTest {
    private static final int W = 37;
    private static final int H = 53;
    private static final int ROWS_PER_STRIP = 7;
    private static final Defect FE = DefectLibrary.byId("fe-i");

    @TempDir
    Path dir;

    /** Layouts of the same lifetimes (PL counts for uint16) and whether they are read straight from the file. */
    static Stream<Arguments> layouts() {
        return Stream.of(Arguments.of("little-endian strips", true), Arguments.of("big-endian strips", true),
                Arguments.of("one strip", true), Arguments.of("tiles", false), Arguments.of("deflate strips", false),
                Arguments.of("deflate, floating-point predictor", false), Arguments.of("uint16 PL counts", false),
                Arguments.of("two pages", false));
    }

    private Path write(String layout) throws IOException {
        float[] s = Fixtures.lifetimes(W, H, 11);
        s[5] = 1e-7f; // below the 1 ns floor: the floor note counts it
        TiffBytes t = layout.startsWith("big") ? TiffBytes.bigEndian() : TiffBytes.littleEndian();
        byte[] bytes;
        switch (layout) {
            case "little-endian strips", "big-endian strips", "deflate strips", "uint16 PL counts" -> {
                boolean deflate = layout.startsWith("deflate");
                boolean counts = layout.startsWith("uint16");
                int[] raw = new int[s.length];
                for (int i = 0; i < raw.length; i++) {
                    raw[i] = s[i] == s[i] ? (int) Math.min(65535, 60 * s[i]) : 0;
                }
                int n = (H + ROWS_PER_STRIP - 1) / ROWS_PER_STRIP;
                byte[][] strips = new byte[n][];
                for (int i = 0; i < n; i++) {
                    int from = i * ROWS_PER_STRIP * W;
                    int to = Math.min(H, (i + 1) * ROWS_PER_STRIP) * W;
                    byte[] b = counts ? t.ushorts(java.util.Arrays.copyOfRange(raw, from, to))
                            : t.floats(java.util.Arrays.copyOfRange(s, from, to));
                    strips[i] = deflate ? TiffBytes.deflate(b) : b;
                }
                t.page(W, H, counts ? 16 : 32, counts ? 1 : 3, deflate ? 8 : 1).tag(278, TiffBytes.LONG,
                        ROWS_PER_STRIP).strips(strips);
                bytes = t.build();
            }
            case "one strip" -> {
                t.floatPage(W, H, s).rational(282, 200, 1).rational(283, 200, 1).tag(296, TiffBytes.SHORT, 3);
                bytes = t.build();
            }
            case "deflate, floating-point predictor" -> {
                t.page(W, H, 32, 3, 8).tag(317, TiffBytes.SHORT, 3)
                        .strips(TiffBytes.deflate(TiffBytes.floatingPointPredictor(s, W, H)));
                bytes = t.build();
            }
            case "two pages" -> {
                t.floatPage(W, H, s);
                t.floatPage(W, H, Fixtures.lifetimes(W, H, 12));
                bytes = t.build();
            }
            case "tiles" -> {
                int tile = 16;
                int across = (W + tile - 1) / tile;
                int down = (H + tile - 1) / tile;
                byte[][] tiles = new byte[across * down][];
                for (int ty = 0; ty < down; ty++) {
                    for (int tx = 0; tx < across; tx++) {
                        float[] v = new float[tile * tile];
                        for (int y = 0; y < tile; y++) {
                            for (int x = 0; x < tile; x++) {
                                int gx = tx * tile + x;
                                int gy = ty * tile + y;
                                v[y * tile + x] = gx < W && gy < H ? s[gy * W + gx] : Float.NaN;
                            }
                        }
                        tiles[ty * across + tx] = t.floats(v);
                    }
                }
                t.page(W, H, 32, 3, 1).remove(278).tag(322, TiffBytes.SHORT, tile).tag(323, TiffBytes.SHORT, tile)
                        .strips(tiles);
                bytes = TiffRoundTripTest.renameTag(TiffRoundTripTest.renameTag(t.build(), 273, 324), 279, 325);
            }
            default -> throw new IllegalArgumentException(layout);
        }
        Path f = dir.resolve(layout.replaceAll("[^a-z0-9]+", "-") + ".tif");
        Files.write(f, bytes);
        return f;
    }

    /** The stream of page 1, as the convert command opens it. */
    private static MapStream stream(Path f) throws IOException {
        return MapStream.open(f);
    }

    private static float[] bandByBand(MapStream s, int rows) throws IOException {
        float[] all = new float[s.width() * s.height()];
        MapStream.Reader r = s.reader(rows);
        float[] band = new float[rows * s.width()];
        for (int row = 0; row < s.height(); row += rows) {
            int n = Math.min(rows, s.height() - row);
            r.read(row, n, band);
            System.arraycopy(band, 0, all, row * s.width(), n * s.width());
        }
        return all;
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("layouts")
    void bandsHoldTheSamplesAndHeaderOfTheWholeRead(String layout, boolean direct) throws Exception {
        Path f = write(layout);
        WaferMap whole = MapFiles.read(f).get(0);
        try (MapStream s = stream(f)) {
            assertThat(s.streamed()).isEqualTo(direct);
            assertThat(s.header()).isEqualTo(MapHeader.of(whole));
            for (int rows : new int[] {1, 5, ROWS_PER_STRIP, 8, H}) {
                assertThat(Fixtures.bits(bandByBand(s, rows))).as("bands of %d rows", rows)
                        .isEqualTo(Fixtures.bits(whole.raster().samples()));
            }
        }
    }

    private static MeasurementConditions conditionsFor(Quantity input) {
        return input == Quantity.PL_COUNTS
                ? new MeasurementConditions(Doping.pType(1.5e16), 180.0, 300.0, null, 1e19, null, null, 2e-27, Map.of())
                : Fixtures.conditions();
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("layouts")
    void bandConversionWritesTheFileOfTheWholeMapConversion(String layout, boolean direct) throws Exception {
        Path f = write(layout);
        WaferMap whole = MapFiles.read(f).get(0);
        MeasurementConditions c = conditionsFor(whole.quantity());
        WaferMap input = whole.withConditions(c);
        for (Quantity q : List.of(Quantity.TRAP_DENSITY, Quantity.STATUS, Quantity.OCCUPANCY)) {
            MapConversion.Result expected = MapConversion.convert(input, FE, ConversionSettings.DEFAULTS,
                    EnumSet.of(q), 1);
            Path reference = dir.resolve("whole-" + q.key() + ".tif");
            MapFiles.write(expected.get(q), reference);
            String floor = MapConversion.lifetimeFloorNote(input);
            for (int threads : new int[] {1, 3}) {
                for (int rows : new int[] {1, 6, H}) {
                    Path out = dir.resolve("bands-" + q.key() + "-" + threads + "-" + rows + ".tif");
                    BandConversion.Summary[] summary = new BandConversion.Summary[1];
                    try (MapStream s = stream(f)) {
                        MapHeader h = s.header().withConditions(c);
                        BandConversion b = BandConversion.of(h, FE, ConversionSettings.DEFAULTS, q);
                        TiffRowWriter.write(out, b.output(), w -> summary[0] = b.run(s, w::write, threads, rows));
                    }
                    String as = q.key() + ", " + threads + " threads, bands of " + rows + " rows";
                    assertThat(Files.readAllBytes(out)).as(as).isEqualTo(Files.readAllBytes(reference));
                    assertThat(summary[0].statusCounts()).as(as).isEqualTo(expected.statusCounts());
                    assertThat(summary[0].warnings()).as(as).isEqualTo(expected.warnings());
                    assertThat(summary[0].floorNote()).as(as).isEqualTo(floor);
                }
            }
            if (whole.quantity() == Quantity.EFFECTIVE_LIFETIME) {
                assertThat(floor).startsWith("2 pixel(s) with a lifetime below 1 ns");
            }
        }
    }

    @Test
    void sidecarNoDataAndUnitApplyToEveryBand() throws Exception {
        float[] s = Fixtures.lifetimes(W, H, 13);
        for (int i = 0; i < s.length; i++) {
            s[i] = s[i] * 1e-6f; // seconds
        }
        for (int i = 3; i < s.length; i += 17) {
            s[i] = -999f;
        }
        TiffBytes t = TiffBytes.bigEndian();
        int n = (H + ROWS_PER_STRIP - 1) / ROWS_PER_STRIP;
        byte[][] strips = new byte[n][];
        for (int i = 0; i < n; i++) {
            strips[i] = t.floats(java.util.Arrays.copyOfRange(s, i * ROWS_PER_STRIP * W,
                    Math.min(H, (i + 1) * ROWS_PER_STRIP) * W));
        }
        t.page(W, H, 32, 3, 1).tag(278, TiffBytes.LONG, ROWS_PER_STRIP).strips(strips);
        Path f = dir.resolve("seconds.tif");
        Files.write(f, t.build());
        Files.writeString(dir.resolve("seconds.json"), "{\"unit\": \"s\", \"no_data\": -999}");
        WaferMap whole = MapFiles.readSingle(f);
        assertThat(whole.provenance().steps().toString()).contains("no-data").contains("convert-unit");
        try (MapStream stream = MapStream.open(f)) {
            assertThat(stream.streamed()).isTrue();
            assertThat(stream.header()).isEqualTo(MapHeader.of(whole));
            assertThat(Fixtures.bits(bandByBand(stream, 4))).isEqualTo(Fixtures.bits(whole.raster().samples()));
        }
    }

    @Test
    void aSampleBeyondTheFloatRangeIsReportedAtItsPixel() throws Exception {
        float[] s = Fixtures.lifetimes(W, H, 14);
        s[30 * W + 4] = 1e36f; // s to µs: 1e42 is beyond the float range
        Path f = dir.resolve("huge.tif");
        TiffBytes t = TiffBytes.littleEndian();
        t.floatPage(W, H, s);
        Files.write(f, t.build());
        Files.writeString(dir.resolve("huge.json"), "{\"unit\": \"s\"}");
        String message;
        try {
            MapFiles.readSingle(f);
            throw new AssertionError("read");
        } catch (MapFormatException e) {
            message = e.getMessage();
        }
        assertThat(message).contains("row 31, column 5");
        try (MapStream stream = MapStream.open(f)) {
            assertThatThrownBy(() -> bandByBand(stream, 8)).isInstanceOf(MapFormatException.class)
                    .hasMessage(message);
        }
    }

    @Test
    void damagedFilesGiveTheMessagesOfTheWholeRead() throws Exception {
        Path f = write("little-endian strips");
        byte[] b = Files.readAllBytes(f);
        Path cut = dir.resolve("cut.tif");
        Files.write(cut, java.util.Arrays.copyOf(b, b.length - 100));
        String message;
        try {
            MapFiles.read(cut);
            throw new AssertionError("read");
        } catch (MapFormatException e) {
            message = e.getMessage();
        }
        assertThat(message).contains("strip 8 of 8").contains("truncated");
        assertThatThrownBy(() -> MapStream.open(cut)).isInstanceOf(MapFormatException.class).hasMessage(message);
        Path deflated = write("deflate strips");
        byte[] d = Files.readAllBytes(deflated);
        java.util.Arrays.fill(d, d.length - 60, d.length - 20, (byte) 0xFF); // scrambles the last strip
        Files.write(deflated, d);
        String corrupt;
        try {
            MapFiles.read(deflated);
            throw new AssertionError("read");
        } catch (MapFormatException e) {
            corrupt = e.getMessage();
        }
        assertThat(corrupt).contains("strip 8 of 8").contains("Deflate");
        assertThatThrownBy(() -> MapStream.open(deflated)).isInstanceOf(MapFormatException.class)
                .hasMessage(corrupt);
        Path empty = dir.resolve("empty.tif");
        Files.write(empty, new byte[0]);
        assertThatThrownBy(() -> MapStream.open(empty)).hasMessage(empty + ": is empty");
    }

    /**
     * A kernel warm-up running beside the conversion (as convert starts it) changes no byte of the output, stops
     * when closed, and one whose conditions cannot be converted (no doping) fails quietly on its own thread;
     * background flushes while the rows are written change no byte either.
     */
    @Test
    void aWarmUpBesideTheConversionChangesNothingAndStopsWhenClosed() throws Exception {
        Path f = write("little-endian strips");
        WaferMap whole = MapFiles.read(f).get(0);
        MeasurementConditions c = conditionsFor(whole.quantity());
        MapConversion.Result expected = MapConversion.convert(whole.withConditions(c), FE,
                ConversionSettings.DEFAULTS, EnumSet.of(Quantity.TRAP_DENSITY), 1);
        Path reference = dir.resolve("whole.tif");
        MapFiles.write(expected.get(Quantity.TRAP_DENSITY), reference);
        Path flushed = dir.resolve("flushed.tif"); // a background flush after every band: the same bytes
        try (MapStream s = MapStream.open(f)) {
            BandConversion b = BandConversion.of(s.header().withConditions(c), FE, ConversionSettings.DEFAULTS,
                    Quantity.TRAP_DENSITY);
            TiffRowWriter.write(flushed, b.output(), w -> b.run(s, w::write, 2, 2), 1);
        }
        assertThat(Files.readAllBytes(flushed)).isEqualTo(Files.readAllBytes(reference));
        Path out = dir.resolve("warm.tif");
        try (HeadStart unusable = BandConversion.warmUp(MeasurementConditions.UNKNOWN, FE,
                ConversionSettings.DEFAULTS, Quantity.TRAP_DENSITY);
             HeadStart warmUp = BandConversion.warmUp(c.overriddenBy(BandConversion.WARM_UP_CONDITIONS),
                     FE, ConversionSettings.DEFAULTS, Quantity.TRAP_DENSITY);
             MapStream s = MapStream.open(f)) {
            BandConversion b = BandConversion.of(s.header().withConditions(c), FE, ConversionSettings.DEFAULTS,
                    Quantity.TRAP_DENSITY);
            TiffRowWriter.write(out, b.output(), w -> b.run(s, w::write, 2, 3));
        }
        assertThat(Files.readAllBytes(out)).isEqualTo(Files.readAllBytes(reference));
        WarmUpThreads.assertAllEnd();
    }

    @Test
    void aFailureHalfWayLeavesNoOutput() throws Exception {
        Path f = write("little-endian strips");
        Path out = dir.resolve("out").resolve("nt.tif");
        try (MapStream s = MapStream.open(f)) {
            BandConversion b = BandConversion.of(s.header().withConditions(Fixtures.conditions()), FE,
                    ConversionSettings.DEFAULTS, Quantity.TRAP_DENSITY);
            int[] bands = new int[1];
            assertThatThrownBy(() -> TiffRowWriter.write(out, b.output(), w -> b.run(s, (row0, rows, v) -> {
                if (++bands[0] == 3) {
                    throw new IOException("disk full");
                }
                w.write(row0, rows, v);
            }, 1, 5))).isInstanceOf(IOException.class).hasMessage("disk full");
        }
        assertThat(out.getParent()).isEmptyDirectory();
    }
}
