package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.catchThrowable;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.model.WaferMap;

/**
 * A map read from its bytes and its sidecar's bytes ({@link MapFiles#readSingle(String, byte[], String, byte[],
 * ReadOptions)}, what a cluster job reads from another file system) equals the map read from the file, and a file
 * that cannot be read fails from its bytes with the file's own message.
 */
class MapBytesTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    @TempDir
    Path dir;

    /** Reads {@code file} both ways; both give equal maps, or both fail with the same message. */
    private static void sameBothWays(Path file) throws IOException {
        Path sidecar = MapFiles.sidecarOf(file);
        byte[] sidecarBytes = Files.isRegularFile(sidecar) ? Files.readAllBytes(sidecar) : null;
        WaferMap fromFile = null;
        MapFormatException fileFailure = null;
        try {
            fromFile = MapFiles.readSingle(file);
        } catch (MapFormatException e) {
            fileFailure = e;
        }
        Throwable bytesFailure = catchThrowable(() -> MapFiles.readSingle(file.toString(),
                Files.readAllBytes(file), sidecar.toString(), sidecarBytes, ReadOptions.DEFAULTS));
        if (fileFailure != null) {
            assertThat(bytesFailure).as(file.toString()).isInstanceOf(MapFormatException.class)
                    .hasMessage(fileFailure.getMessage());
            return;
        }
        assertThat(bytesFailure).as(file.toString()).isNull();
        WaferMap fromBytes = MapFiles.readSingle(file.toString(), Files.readAllBytes(file), sidecar.toString(),
                sidecarBytes, ReadOptions.DEFAULTS);
        assertThat(Arrays.equals(fromBytes.raster().samples(), fromFile.raster().samples())).as(file.toString())
                .isTrue();
        assertThat(fromBytes.grid()).isEqualTo(fromFile.grid());
        assertThat(fromBytes.quantity()).isEqualTo(fromFile.quantity());
        assertThat(fromBytes.waferId()).isEqualTo(fromFile.waferId());
        assertThat(fromBytes.conditions()).isEqualTo(fromFile.conditions());
        assertThat(fromBytes.provenance()).isEqualTo(fromFile.provenance());
    }

    @Test
    void everyDemonstrationMapReadsTheSameFromItsBytes() throws IOException {
        List<Path> maps = new ArrayList<>();
        try (Stream<Path> s = Files.list(DEMO)) {
            s.filter(p -> p.toString().endsWith(".tif")).sorted().forEach(maps::add);
        }
        assertThat(maps).hasSizeGreaterThanOrEqualTo(17);
        for (Path m : maps) {
            sameBothWays(m);
        }
    }

    @Test
    void compressedTiffAndCsvMapsReadTheSameFromTheirBytes() throws IOException {
        WaferMap original = MapFiles.readSingle(DEMO.resolve("LOT-A01-W01.tif"));
        for (WriteOptions.TiffCompression c : WriteOptions.TiffCompression.values()) {
            Path f = dir.resolve("w-" + c + ".tif");
            MapFiles.write(original, f, WriteOptions.DEFAULTS.withTiffCompression(c));
            sameBothWays(f);
        }
        Path csv = dir.resolve("w.csv");
        MapFiles.write(original, csv);
        sameBothWays(csv);
    }

    @Test
    void damagedFilesAndSidecarsFailFromTheirBytesWithTheFilesMessages() throws IOException {
        byte[] tif = Files.readAllBytes(DEMO.resolve("LOT-A01-W01.tif"));
        Path empty = Files.write(dir.resolve("empty.tif"), new byte[0]);
        Path cut = Files.write(dir.resolve("cut.tif"), Arrays.copyOf(tif, tif.length / 3));
        Path png = Files.write(dir.resolve("picture.tif"), new byte[] {(byte) 0x89, 'P', 'N', 'G', 13, 10, 26, 10});
        Path text = Files.write(dir.resolve("notes.dat"), "not a map".getBytes(StandardCharsets.UTF_8));
        Path badSidecar = Files.write(dir.resolve("bad-sidecar.tif"), tif);
        Files.writeString(dir.resolve("bad-sidecar.json"), "{\"conditions\": {\"thickness_um\": \"thick\"}}");
        Path notUtf8 = Files.write(dir.resolve("latin1.tif"), tif);
        Files.write(dir.resolve("latin1.json"), new byte[] {'{', '"', (byte) 0xE9, '"', ':', '1', '}'});
        Path bigSidecar = Files.write(dir.resolve("big-sidecar.tif"), tif);
        Files.write(dir.resolve("big-sidecar.json"), new byte[(int) Sidecar.MAX_BYTES + 1]);
        for (Path f : List.of(empty, cut, png, text, badSidecar, notUtf8, bigSidecar)) {
            Throwable t = catchThrowable(() -> MapFiles.readSingle(f));
            assertThat(t).as(f.toString()).isInstanceOf(MapFormatException.class);
            sameBothWays(f);
        }
    }
}
