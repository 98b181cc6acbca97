package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import javax.imageio.plugins.tiff.TIFFDirectory;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

class TiffRoundTripTest {
    @TempDir
    Path dir;

    /**
     * Same samples bit for bit (NaN payloads aside: the JDK writer stores every NaN as the canonical NaN; NaN means
     * "no data" whatever its payload), same facts.
     */
    private static void assertSameMap(WaferMap actual, WaferMap expected) {
        assertThat(Fixtures.canonicalBits(actual.raster().samples()))
                .isEqualTo(Fixtures.canonicalBits(expected.raster().samples()));
        assertThat(actual.grid()).isEqualTo(expected.grid());
        assertThat(actual.quantity()).isEqualTo(expected.quantity());
        assertThat(actual.waferId()).isEqualTo(expected.waferId());
        assertThat(actual.conditions()).isEqualTo(expected.conditions());
        assertThat(actual.provenance()).isEqualTo(expected.provenance());
    }

    @ParameterizedTest
    @EnumSource(WriteOptions.TiffCompression.class)
    void writtenMapReadsBackIdentically(WriteOptions.TiffCompression compression) throws Exception {
        WaferMap map = Fixtures.lifetimeMap(37, 23, 7);
        Path f = dir.resolve("w07.tif");
        MapFiles.write(map, f, WriteOptions.DEFAULTS.withTiffCompression(compression));

        assertSameMap(MapFiles.readSingle(f), map);
    }

    @ParameterizedTest
    @EnumSource(WriteOptions.TiffCompression.class)
    void secondReaderSeesTheSameSamplesBitForBit(WriteOptions.TiffCompression compression) throws Exception {
        WaferMap map = Fixtures.lifetimeMap(40, 31, 11);
        Path f = dir.resolve("w.tif");
        MapFiles.write(map, f, WriteOptions.DEFAULTS.withTiffCompression(compression));

        assertThat(Fixtures.canonicalBits(Fixtures.readWithJdk(f, 0)))
                .isEqualTo(Fixtures.canonicalBits(map.raster().samples()));
    }

    @Test
    void fastWriterKeepsEvenNanPayloads() throws Exception {
        WaferMap map = Fixtures.lifetimeMap(9, 7, 12);
        Path f = dir.resolve("payload.tif");
        MapFiles.write(map, f);

        assertThat(Fixtures.bits(MapFiles.readSingle(f).raster().samples()))
                .isEqualTo(Fixtures.bits(map.raster().samples()));
        assertThat(Fixtures.bits(Fixtures.readWithJdk(f, 0))).isEqualTo(Fixtures.bits(map.raster().samples()));
    }

    @Test
    void fastWriterAndImageIoWriterGiveEqualMaps() throws Exception {
        WaferMap map = Fixtures.lifetimeMap(64, 48, 3);
        Path fast = dir.resolve("fast.tif");
        Path jdk = dir.resolve("jdk.tif");
        FastTiffWriter.write(List.of(map), fast);
        TiffMaps.writeWithImageIo(List.of(map), jdk, WriteOptions.TiffCompression.NONE);

        assertSameMap(MapFiles.readSingle(fast), map);
        assertSameMap(MapFiles.readSingle(jdk), map);
        assertThat(Fixtures.bits(Fixtures.readWithJdk(fast, 0))).isEqualTo(Fixtures.bits(map.raster().samples()));
    }

    @Test
    void metadataIsInImageDescriptionAndPitchInResolutionTags() throws Exception {
        WaferMap map = Fixtures.lifetimeMap(10, 10, 1).withGrid(PixelGrid.centred(10, 10, 0.5));
        Path f = dir.resolve("meta.tif");
        MapFiles.write(map, f);

        TIFFDirectory d = Fixtures.directoryWithJdk(f, 0);
        JsonNode json = Sidecar.JSON.readTree(d.getTIFFField(270).getAsString(0));
        assertThat(json.get("format").asText()).isEqualTo(Sidecar.FORMAT);
        assertThat(json.get("wafer_id").asText()).isEqualTo("w07");
        assertThat(json.get("unit").asText()).isEqualTo("us");
        assertThat(json.at("/conditions/doping").asText()).isEqualTo("p:1.5E16");
        assertThat(d.getTIFFField(282).getAsDouble(0)).isEqualTo(20.0); // 20 px/cm = 0.5 mm
        assertThat(d.getTIFFField(283).getAsDouble(0)).isEqualTo(20.0);
        assertThat(d.getTIFFField(296).getAsInt(0)).isEqualTo(3); // centimetre
        assertThat(d.getTIFFField(339).getAsInt(0)).isEqualTo(3); // IEEE float
        assertThat(d.getTIFFField(258).getAsInt(0)).isEqualTo(32);
    }

    @ParameterizedTest
    @EnumSource(value = WriteOptions.TiffCompression.class, names = {"NONE", "DEFLATE", "LZW"})
    void multiPageFileGivesOneMapPerPage(WriteOptions.TiffCompression compression) throws Exception {
        WaferMap before = withLabel(Fixtures.lifetimeMap(30, 20, 1), "before");
        WaferMap after = withLabel(Fixtures.lifetimeMap(30, 20, 2), "after");
        Path f = dir.resolve("pair.tif");
        MapFiles.writeAll(List.of(before, after), f, WriteOptions.DEFAULTS.withTiffCompression(compression));

        List<WaferMap> maps = MapFiles.read(f);
        assertThat(maps).hasSize(2);
        assertSameMap(maps.get(0), before);
        assertSameMap(maps.get(1), after);
        assertThat(Fixtures.pagesWithJdk(f)).isEqualTo(2);
        assertThat(Fixtures.canonicalBits(Fixtures.readWithJdk(f, 1)))
                .isEqualTo(Fixtures.canonicalBits(after.raster().samples()));
    }

    private static WaferMap withLabel(WaferMap m, String label) {
        return m.withConditions(m.conditions().overriddenBy(new MeasurementConditions(null, null, null, null, null,
                null, null, null, Map.of("page", label))));
    }

    @Test
    void sidecarPagesLabelTheMapsOfAForeignMultiPageFile() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.floatPage(2, 2, new float[] {1, 2, 3, 4});
        t.floatPage(2, 2, new float[] {5, 6, 7, 8});
        Path f = dir.resolve("fe.tif");
        Files.write(f, t.build());
        Files.writeString(dir.resolve("fe.json"), "{\"pages\": [\"before\", \"after\"], \"unit\": \"us\"}");

        List<WaferMap> maps = MapFiles.read(f);
        assertThat(maps).extracting(m -> m.conditions().extra().get("page")).containsExactly("before", "after");
        assertThat(maps.get(1).raster().samples()).containsExactly(5, 6, 7, 8);
    }

    @Test
    void mapsOfEveryQuantityRoundTrip() throws Exception {
        for (Quantity q : Quantity.values()) {
            WaferMap m = new WaferMap(FloatRaster.wrap(3, 2, new float[] {0, 1, 2, Float.NaN, -5, 1e20f}),
                    PixelGrid.centred(3, 2, 2.0), q, "", MeasurementConditions.UNKNOWN, Provenance.of(""));
            Path f = dir.resolve(q.key() + ".tif");
            MapFiles.write(m, f);
            assertSameMap(MapFiles.readSingle(f), m);
        }
    }

    @Test
    void largeMapRoundTripsThroughTheFastWriter() throws Exception {
        WaferMap map = Fixtures.lifetimeMap(1024, 700, 5);
        Path f = dir.resolve("big.tif");
        MapFiles.write(map, f);

        assertThat(Files.size(f)).isGreaterThan(4L * 1024 * 700);
        assertSameMap(MapFiles.readSingle(f), map);
    }

    @Test
    void floatPredictorFileIsDecodedByTheFallbackPlugin() throws Exception {
        int w = 9;
        int h = 5;
        float[] s = Fixtures.lifetimes(w, h, 4);
        TiffBytes t = TiffBytes.littleEndian();
        t.page(w, h, 32, 3, 8).tag(317, TiffBytes.SHORT, 3)
                .strips(TiffBytes.deflate(TiffBytes.floatingPointPredictor(s, w, h)));
        Path f = dir.resolve("predictor3.tif");
        Files.write(f, t.build());

        WaferMap m = MapFiles.readSingle(f);
        assertThat(Fixtures.bits(m.raster().samples())).isEqualTo(Fixtures.bits(s));
        assertThat(m.provenance().steps().get(0).parameters()).containsEntry("decoder", "twelvemonkeys");
    }

    /** Uncompressed float strips are read without a decoder: the same bits as the JDK plugin decodes. */
    @org.junit.jupiter.params.ParameterizedTest
    @org.junit.jupiter.params.provider.ValueSource(booleans = {true, false})
    void directStripReadingEqualsTheJdkDecoderBitForBit(boolean little) throws Exception {
        int w = 37;
        int h = 23;
        java.util.Random rnd = new java.util.Random(w * h);
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = (float) Math.exp(rnd.nextGaussian() * 4);
        }
        s[3] = Float.NaN;
        s[4] = Float.intBitsToFloat(0x7fc12345); // NaN with a payload
        s[5] = -0f;
        s[6] = Float.MIN_VALUE;
        s[7] = Float.NEGATIVE_INFINITY;
        TiffBytes t = little ? TiffBytes.littleEndian() : TiffBytes.bigEndian();
        byte[] all = t.floats(s);
        int rps = 5; // five strips, the last of three rows
        java.util.List<byte[]> strips = new java.util.ArrayList<>();
        for (int r = 0; r < h; r += rps) {
            strips.add(java.util.Arrays.copyOfRange(all, r * w * 4, Math.min(h, r + rps) * w * 4));
        }
        t.page(w, h, 32, 3, 1).tag(278, TiffBytes.LONG, rps).strips(strips.toArray(new byte[0][]));
        Path f = dir.resolve("strips.tif");
        Files.write(f, t.build());

        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.provenance().steps().get(0).parameters()).containsEntry("decoder", "direct");
        assertThat(Fixtures.bits(m.raster().samples())).isEqualTo(Fixtures.bits(s));
        javax.imageio.ImageReader jdk = null;
        for (var it = javax.imageio.ImageIO.getImageReadersByFormatName("tiff"); it.hasNext();) {
            javax.imageio.ImageReader r = it.next();
            if (r.getClass().getName().startsWith("com.sun.imageio.plugins.tiff")) {
                jdk = r;
            }
        }
        assertThat(jdk).isNotNull();
        try (var in = javax.imageio.ImageIO.createImageInputStream(f.toFile())) {
            jdk.setInput(in);
            float[] decoded = jdk.read(0).getRaster().getSamples(0, 0, w, h, 0, new float[w * h]);
            assertThat(Fixtures.bits(m.raster().samples())).isEqualTo(Fixtures.bits(decoded));
        } finally {
            jdk.dispose();
        }
    }

    /**
     * The direct path keeps one read buffer per thread: files of either byte order, each larger than that buffer,
     * read in turn on one thread give their own values bit for bit.
     */
    @Test
    void filesOfBothByteOrdersReadInTurnOnOneThread() throws Exception {
        int w = 600;
        int h = 500; // 1.2 MB of samples: more than one fill of the 1 MiB buffer
        java.util.Random rnd = new java.util.Random(5);
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = i % 997 == 0 ? Float.NaN : (float) Math.exp(rnd.nextGaussian() * 4);
        }
        Path little = dir.resolve("little.tif");
        TiffBytes le = TiffBytes.littleEndian();
        le.floatPage(w, h, s);
        Files.write(little, le.build());
        Path big = dir.resolve("big.tif");
        TiffBytes be = TiffBytes.bigEndian();
        be.floatPage(w, h, s);
        Files.write(big, be.build());
        for (Path f : new Path[] {little, big, little, big}) {
            WaferMap m = MapFiles.readSingle(f);
            assertThat(m.provenance().steps().get(0).parameters()).containsEntry("decoder", "direct");
            assertThat(Fixtures.bits(m.raster().samples())).as(f.getFileName().toString())
                    .isEqualTo(Fixtures.bits(s));
        }
    }

    @Test
    void bigEndianFloatFileIsRead() throws Exception {
        TiffBytes t = TiffBytes.bigEndian();
        float[] s = {1.5f, Float.NaN, 3e-3f, 1e4f, 7, 8};
        t.floatPage(3, 2, s);
        Path f = dir.resolve("be.tif");
        Files.write(f, t.build());

        assertThat(Fixtures.bits(MapFiles.readSingle(f).raster().samples())).isEqualTo(Fixtures.bits(s));
    }

    @Test
    void foreignFloatFileRecordsEveryAssumption() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.floatPage(2, 2, new float[] {10, 20, 30, 40});
        Path f = dir.resolve("plain.tif");
        Files.write(f, t.build());

        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.quantity()).isEqualTo(Quantity.EFFECTIVE_LIFETIME);
        assertThat(m.waferId()).isEqualTo("plain");
        assertThat(m.grid()).isEqualTo(PixelGrid.centred(2, 2, 1.0));
        assertThat(m.provenance().source()).isEqualTo("plain.tif");
        assertThat(m.provenance().steps()).extracting(ProcessingStep::operation)
                .containsExactly("read", "assume", "assume", "assume");
        assertThat(m.provenance().steps()).extracting(st -> st.parameters().get("note")).contains(
                "quantity assumed: effective-lifetime", "unit assumed: µs", "pixel pitch assumed: 1 mm");
    }

    @Test
    void resolutionInCentimetresGivesThePitch() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.floatPage(2, 1, new float[] {1, 2}).rational(282, 40, 1).rational(283, 40, 1).tag(296, TiffBytes.SHORT, 3);
        Path f = dir.resolve("res.tif");
        Files.write(f, t.build());

        assertThat(MapFiles.readSingle(f).grid().pitchMm()).isEqualTo(0.25);
    }

    @Test
    void sixteenBitSamplesAreScaledWithSidecarScaleAndOffset() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        int[] raw = {0, 1, 1000, 65535};
        t.page(2, 2, 16, 1, 1).strips(t.ushorts(raw));
        Path f = dir.resolve("u16.tif");
        Files.write(f, t.build());
        Files.writeString(dir.resolve("u16.json"), "{\"quantity\": \"effective-lifetime\", \"unit\": \"ms\","
                + " \"scale\": 0.01, \"offset\": 0.5, \"no_data\": 0, \"pixel_pitch_mm\": 0.5}");

        WaferMap m = MapFiles.readSingle(f);
        // value = (offset + scale * raw) ms, converted to µs; raw 0 is no data
        assertThat(m.raster().samples()).containsExactly(Float.NaN, (float) (1000 * (0.5 + 0.01)),
                (float) (1000 * (0.5 + 10.0)), (float) (1000 * (0.5 + 655.35)));
        assertThat(m.provenance().steps()).extracting(ProcessingStep::operation)
                .containsExactly("read", "sidecar", "no-data", "scale", "convert-unit");
    }

    @Test
    void sixteenBitScaleMayComeFromTheEmbeddedDescription() throws Exception {
        TiffBytes t = TiffBytes.bigEndian();
        t.page(3, 1, 16, 1, 1).strips(t.ushorts(new int[] {100, 200, 300}))
                .ascii(270, "{\"quantity\": \"effective-lifetime\", \"unit\": \"us\", \"scale\": 0.5,"
                        + " \"pixel_pitch_mm\": 2}");
        Path f = dir.resolve("emb.tif");
        Files.write(f, t.build());

        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.raster().samples()).containsExactly(50, 100, 150);
        assertThat(m.grid().pitchMm()).isEqualTo(2.0);
    }

    @Test
    void unscaledSixteenBitSamplesAreCounts() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.page(2, 1, 16, 1, 1).strips(t.ushorts(new int[] {12000, 65535}));
        Path f = dir.resolve("pl.tif");
        Files.write(f, t.build());

        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.quantity()).isEqualTo(Quantity.PL_COUNTS);
        assertThat(m.raster().samples()).containsExactly(12000, 65535);
        assertThat(m.provenance().steps()).extracting(st -> st.parameters().get("note"))
                .contains("quantity assumed: pl-counts (integer samples without scale)");
    }

    @Test
    void sidecarQuantityOverridesTheCountsDefault() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.page(2, 1, 16, 1, 1).strips(t.ushorts(new int[] {12, 34}));
        Path f = dir.resolve("tau.tif");
        Files.write(f, t.build());
        Files.writeString(dir.resolve("tau.json"), "{\"quantity\": \"effective-lifetime\", \"unit\": \"us\"}");

        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.quantity()).isEqualTo(Quantity.EFFECTIVE_LIFETIME);
        assertThat(m.raster().samples()).containsExactly(12, 34);
    }

    @Test
    void eightBitGreyIsRead() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.page(4, 1, 8, 1, 1).strips(new byte[] {0, 1, (byte) 128, (byte) 255});
        Path f = dir.resolve("grey.tif");
        Files.write(f, t.build());

        assertThat(MapFiles.readSingle(f).raster().samples()).containsExactly(0, 1, 128, 255);
    }

    @Test
    void packBitsAndMultiStripFilesFromOtherWritersAreRead() throws Exception {
        // two strips of one row each, the first stored as a PackBits literal run, the second as a repeat run
        TiffBytes t = TiffBytes.littleEndian();
        t.page(3, 2, 8, 1, 32773).tag(278, TiffBytes.LONG, 1)
                .strips(new byte[] {2, 10, 20, 30}, new byte[] {-2, 7});
        Path f = dir.resolve("pb.tif");
        Files.write(f, t.build());

        assertThat(MapFiles.readSingle(f).raster().samples()).containsExactly(10, 20, 30, 7, 7, 7);
    }

    @Test
    void sidecarOverridesEmbeddedMetadata() throws Exception {
        WaferMap map = Fixtures.lifetimeMap(4, 3, 2);
        Path f = dir.resolve("w07.tif");
        MapFiles.write(map, f);
        Files.writeString(dir.resolve("w07.json"), "{\"wafer_id\": \"w07-b\", \"pixel_pitch_mm\": 1.25,"
                + " \"conditions\": {\"thickness_um\": 160}}");

        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.waferId()).isEqualTo("w07-b");
        assertThat(m.grid().pitchMm()).isEqualTo(1.25);
        assertThat(m.conditions().thicknessUm()).isEqualTo(160.0);
        assertThat(m.conditions().doping()).isEqualTo(map.conditions().doping());
        assertThat(m.provenance().steps()).endsWith(ProcessingStep.of("sidecar", "file",
                dir.resolve("w07.json").toString()));
    }

    @Test
    void tiledFilesAreRead() throws Exception {
        int w = 40;
        int h = 20;
        float[] s = Fixtures.lifetimes(w, h, 9);
        TiffBytes t = TiffBytes.littleEndian();
        byte[][] tiles = new byte[6][];
        for (int ty = 0; ty < 2; ty++) {
            for (int tx = 0; tx < 3; tx++) {
                float[] tile = new float[16 * 16];
                java.util.Arrays.fill(tile, Float.NaN);
                for (int y = 0; y < 16; y++) {
                    for (int x = 0; x < 16; x++) {
                        int gx = tx * 16 + x;
                        int gy = ty * 16 + y;
                        if (gx < w && gy < h) {
                            tile[y * 16 + x] = s[gy * w + gx];
                        }
                    }
                }
                tiles[ty * 3 + tx] = t.floats(tile);
            }
        }
        TiffBytes.Page p = t.page(w, h, 32, 3, 1).remove(278).tag(322, TiffBytes.SHORT, 16)
                .tag(323, TiffBytes.SHORT, 16).strips(tiles);
        byte[] bytes = t.build();
        // the builder filled StripOffsets/StripByteCounts; rename them to TileOffsets/TileByteCounts (324/325)
        bytes = renameTag(bytes, 273, 324);
        bytes = renameTag(bytes, 279, 325);
        Path f = dir.resolve("tiled.tif");
        Files.write(f, bytes);
        assertThat(p).isNotNull();

        assertThat(Fixtures.bits(MapFiles.readSingle(f).raster().samples())).isEqualTo(Fixtures.bits(s));
    }

    /** Changes a tag number in the first IFD of a little-endian file (entries keep their order). */
    static byte[] renameTag(byte[] b, int from, int to) {
        int ifd = (b[4] & 0xFF) | (b[5] & 0xFF) << 8 | (b[6] & 0xFF) << 16 | (b[7] & 0xFF) << 24;
        int n = (b[ifd] & 0xFF) | (b[ifd + 1] & 0xFF) << 8;
        for (int i = 0; i < n; i++) {
            int p = ifd + 2 + 12 * i;
            int tag = (b[p] & 0xFF) | (b[p + 1] & 0xFF) << 8;
            if (tag == from) {
                b[p] = (byte) to;
                b[p + 1] = (byte) (to >> 8);
            }
        }
        return b;
    }
}
