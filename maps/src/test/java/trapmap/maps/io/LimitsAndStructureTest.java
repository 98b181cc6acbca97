package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Arrays;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class LimitsAndStructureTest {
    @TempDir
    Path dir;

    private Path write(String name, byte[] bytes) throws Exception {
        Path f = dir.resolve(name);
        Files.write(f, bytes);
        return f;
    }

    @Test
    void hugeImageClaimedByTheHeaderIsRefusedBeforeAnyAllocation() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.page(100_000, 100_000, 32, 3, 1).tag(278, TiffBytes.LONG, 1).tag(273, TiffBytes.LONG, 8)
                .tag(279, TiffBytes.LONG, 400_000).manualStrips();
        Path f = write("huge.tif", t.build());

        assertTimeoutPreemptively(Duration.ofSeconds(2), () ->
                assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                        .hasMessage(f + ": page 1 (directory at byte 8), tag 256 (ImageWidth) at byte 10: the image is"
                                + " 100000 × 100000 = 10000000000 pixels, more than the limit of 67108864 pixels"
                                + " (ReadOptions.maxPixels)"));
    }

    @Test
    void pixelLimitCountsAllPages() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.floatPage(4, 4, new float[16]);
        t.floatPage(4, 4, new float[16]);
        Path f = write("two.tif", t.build());

        assertThat(MapFiles.read(f, ReadOptions.DEFAULTS.withMaxPixels(32))).hasSize(2);
        assertThatThrownBy(() -> MapFiles.read(f, ReadOptions.DEFAULTS.withMaxPixels(31)))
                .hasMessageContaining("the pages hold 32 pixels together so far, more than the limit of 31 pixels");
    }

    @Test
    void fileSizeLimitIsCheckedFirst() throws Exception {
        Path f = write("big.csv", new byte[2000]);
        assertThatThrownBy(() -> MapFiles.read(f, ReadOptions.DEFAULTS.withMaxFileBytes(1000)))
                .hasMessage(f + ": is 2000 bytes, more than the limit of 1000 bytes (ReadOptions.maxFileBytes)");
    }

    @Test
    void csvGridBeyondThePixelLimitIsRefusedWhileReading() throws Exception {
        Path f = dir.resolve("g.csv");
        Files.writeString(f, "1,2,3\n4,5,6\n7,8,9\n");
        assertThatThrownBy(() -> MapFiles.read(f, ReadOptions.DEFAULTS.withMaxPixels(8)))
                .hasMessage(f + ": line 3: the grid exceeds the limit of 8 pixels (ReadOptions.maxPixels)");
    }

    @Test
    void csvPointsSpanningTooManyPixelsAreRefused() throws Exception {
        Path f = dir.resolve("p.csv");
        Files.writeString(f, "# pixel_pitch_mm=0.001\nx,y,value\n0,0,1\n100,100,2\n");
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessageContaining("the points span 100001 × 100001 ="
                + " 10000200001 pixels at pitch 0.001 mm, more than the limit of 67108864 pixels");
    }

    @Test
    void truncatedStripIsRefusedNamingTheStrip() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.floatPage(8, 8, new float[64]);
        byte[] full = t.build();
        Path f = write("cut.tif", Arrays.copyOf(full, full.length - 10));
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessageContaining("strip 1 of 1: read error: got 246 of its"
                + " 256 bytes at byte").hasMessageContaining("the file is truncated");
    }

    @Test
    void shortStripOfAnUncompressedImageIsRefused() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.page(4, 4, 32, 3, 1).strips(new byte[60]);
        Path f = write("short.tif", t.build());
        assertThatThrownBy(() -> MapFiles.read(f))
                .hasMessageContaining("strip 1 of 1: read error: got 60 bytes, expected 64");
    }

    @Test
    void directoryLoopIsRefused() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.floatPage(1, 1, new float[] {1});
        byte[] b = t.build();
        // point the first directory's "next" field back at itself
        int n = b[8] & 0xFF;
        ByteBuffer.wrap(b).order(ByteOrder.LITTLE_ENDIAN).putInt(8 + 2 + 12 * n, 8);
        Path f = write("loop.tif", b);
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessageContaining("the chain of pages loops back to the"
                + " directory at byte 8");
    }

    @Test
    void duplicateTagIsRefused() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.floatPage(2, 1, new float[] {1, 2});
        byte[] b = TiffRoundTripTest.renameTag(t.build(), 257, 256);
        Path f = write("dup.tif", b);
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessageContaining("tag 256 (ImageWidth) at byte 22: appears"
                + " twice in the directory");
    }

    @Test
    void unsupportedSampleTypesAndCompressionsAreNamed() throws Exception {
        TiffBytes t1 = TiffBytes.littleEndian();
        t1.page(2, 1, 16, 2, 1).strips(new byte[4]);
        assertThatThrownBy(() -> MapFiles.read(write("s16.tif", t1.build())))
                .hasMessageContaining("unsupported samples: 16-bit signed integer; supported are 32-bit float and"
                        + " 16- or 8-bit unsigned integer");

        TiffBytes t2 = TiffBytes.littleEndian();
        t2.page(2, 1, 8, 1, 7).strips(new byte[4]);
        assertThatThrownBy(() -> MapFiles.read(write("jpeg.tif", t2.build())))
                .hasMessageContaining("compression JPEG is not supported");

        TiffBytes t3 = TiffBytes.littleEndian();
        t3.page(2, 1, 8, 1, 1).tag(277, TiffBytes.SHORT, 3).strips(new byte[6]);
        assertThatThrownBy(() -> MapFiles.read(write("rgb.tif", t3.build())))
                .hasMessageContaining("the image has 3 samples per pixel (colour or with alpha); a map needs 1");

        TiffBytes t4 = TiffBytes.littleEndian();
        t4.page(2, 1, 8, 1, 1).tag(262, TiffBytes.SHORT, 0).strips(new byte[2]);
        assertThatThrownBy(() -> MapFiles.read(write("white.tif", t4.build())))
                .hasMessageContaining("photometric interpretation 0 is not supported");
    }

    @Test
    void missingStripOffsetsIsRefused() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.page(2, 1, 8, 1, 1);
        Path f = write("nodata.tif", t.build());
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessageContaining("tag 273 (StripOffsets) is missing");
    }

    @Test
    void bigTiffAndOtherSignaturesAreRefused() throws Exception {
        Path big = write("big.tif", new byte[] {'I', 'I', 43, 0, 8, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0});
        assertThatThrownBy(() -> MapFiles.read(big)).hasMessage(big + ": byte 2: is a BigTIFF file, which is not"
                + " supported; save it as a classic TIFF (files up to 4 GiB)");
        Path junk = write("junk.tif", "hello, world".getBytes());
        assertThatThrownBy(() -> MapFiles.read(junk)).hasMessage(junk + ": byte 0: is not a TIFF file (it starts"
                + " with neither 'II' nor 'MM')");
        Path tiny = write("tiny.tif", new byte[] {'I', 'I', 42});
        assertThatThrownBy(() -> MapFiles.read(tiny)).hasMessage(tiny + ": byte 0: is too short for a TIFF file (3"
                + " bytes; the header alone needs 8)");
    }

    @Test
    void corruptCompressedDataIsAMapFormatException() throws Exception {
        TiffBytes t = TiffBytes.littleEndian();
        t.page(16, 16, 32, 3, 8).strips(new byte[] {1, 2, 3, 4, 5, 6, 7, 8, 9, 10});
        Path f = write("corrupt.tif", t.build());
        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessage(f + ": page 1 (directory at byte 8), strip 1 of 1: read error: the Deflate data are"
                        + " corrupt (incorrect header check) after 0 decoded bytes, expected 1024");
    }
}
