package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.FileTime;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.model.WaferMap;

class MapFilesTest {
    @TempDir
    Path dir;

    @Test
    void missingFileDirectoryAndEmptyFileAreNamed() throws Exception {
        Path none = dir.resolve("none.tif");
        assertThatThrownBy(() -> MapFiles.read(none)).isInstanceOf(MapFormatException.class)
                .hasMessage(none + ": no such file");
        Path sub = Files.createDirectory(dir.resolve("sub.tif"));
        assertThatThrownBy(() -> MapFiles.read(sub)).hasMessage(sub + ": is a directory, not a regular file");
        Path empty = Files.createFile(dir.resolve("empty.csv"));
        assertThatThrownBy(() -> MapFiles.read(empty)).hasMessage(empty + ": is empty");
    }

    @Test
    void danglingLinksAndDevicesAreNamedWithoutBeingOpenedForTheMapAndItsSidecar() throws Exception {
        Path gone = Files.createSymbolicLink(dir.resolve("gone.tif"), dir.resolve("deleted.tif"));
        assertThatThrownBy(() -> MapFiles.read(gone)).isInstanceOf(MapFormatException.class)
                .hasMessage(gone + ": is a dangling link to " + dir.resolve("deleted.tif") + " (no such file)");
        Path device = Files.createSymbolicLink(dir.resolve("device.csv"), Path.of("/dev/zero"));
        assertThatThrownBy(() -> MapFiles.read(device)).hasMessage(device + ": is a FIFO, socket or device, not a regular file");
        Path map = dir.resolve("w.tif");
        Files.write(map, SidecarTest.plainTiff());
        Path sidecar = Files.createSymbolicLink(dir.resolve("w.json"), Path.of("/dev/zero")); // would never end
        assertThatThrownBy(() -> MapFiles.read(map)).hasMessageStartingWith(sidecar + ": ").hasMessageContaining("not a regular file");
        Files.delete(sidecar);
        Files.createSymbolicLink(sidecar, dir.resolve("w-old.json"));
        assertThatThrownBy(() -> MapFiles.read(map)).hasMessage(sidecar + ": is a dangling link to "
                + dir.resolve("w-old.json") + " (no such sidecar file)");
        Files.delete(sidecar);
        assertThat(MapFiles.readSingle(map).raster().samples()).containsExactly(1, 2, 3, 4);
    }

    @Test
    void unknownExtensionIsRefusedUnlessTheContentIsTiff() throws Exception {
        Path dat = dir.resolve("w.dat");
        Files.writeString(dat, "1,2\n");
        assertThatThrownBy(() -> MapFiles.read(dat)).hasMessage(dat + ": unsupported file type '.dat'; maps are read"
                + " from .tif, .tiff and .csv files");

        Path tif = dir.resolve("w.bin");
        Files.write(tif, SidecarTest.plainTiff());
        assertThat(MapFiles.readSingle(tif).raster().samples()).containsExactly(1, 2, 3, 4);
    }

    @Test
    void readSingleRefusesMultiPageFiles() throws Exception {
        Path f = dir.resolve("two.tif");
        MapFiles.writeAll(List.of(Fixtures.lifetimeMap(3, 3, 1), Fixtures.lifetimeMap(3, 3, 2)), f,
                WriteOptions.DEFAULTS);
        assertThatThrownBy(() -> MapFiles.readSingle(f)).hasMessage(f + ": holds 2 maps (pages) where one is"
                + " expected");
    }

    @Test
    void writingRefusesUnknownExtensionsAndSeveralMapsInOneCsv() {
        WaferMap m = Fixtures.lifetimeMap(3, 3, 1);
        Path dat = dir.resolve("w.dat");
        assertThatThrownBy(() -> MapFiles.write(m, dat)).isInstanceOf(MapFormatException.class)
                .hasMessage(dat + ": unsupported file type '.dat' for writing; use .tif, .tiff, .csv or .png");
        Path csv = dir.resolve("w.csv");
        assertThatThrownBy(() -> MapFiles.writeAll(List.of(m, m), csv, WriteOptions.DEFAULTS))
                .hasMessage(csv + ": a CSV file holds one map, not 2; write several maps to a multi-page .tif");
    }

    @Test
    void readingLeavesTheInputUntouched() throws Exception {
        Path f = dir.resolve("in.tif");
        MapFiles.write(Fixtures.lifetimeMap(20, 10, 3), f);
        Files.writeString(dir.resolve("in.json"), "{\"wafer_id\": \"x\"}");
        FileTime old = FileTime.fromMillis(1_000_000_000_000L);
        Files.setLastModifiedTime(f, old);
        byte[] before = Files.readAllBytes(f);

        MapFiles.read(f);
        assertThat(Files.readAllBytes(f)).isEqualTo(before);
        assertThat(Files.getLastModifiedTime(f)).isEqualTo(old);
        assertThat(listing()).containsExactlyInAnyOrder("in.tif", "in.json");
    }

    @Test
    void writesLeaveNoTemporaryFiles() throws Exception {
        WaferMap m = Fixtures.lifetimeMap(30, 20, 1);
        for (String n : List.of("a.tif", "b.csv", "c.png")) {
            MapFiles.write(m, dir.resolve(n));
        }
        MapFiles.write(m, dir.resolve("d.tif"), WriteOptions.DEFAULTS.withTiffCompression(
                WriteOptions.TiffCompression.DEFLATE));
        MapFiles.write(m, dir.resolve("a.tif")); // replace
        assertThat(listing()).containsExactlyInAnyOrder("a.tif", "b.csv", "c.png", "d.tif");
    }

    @Test
    void failedWriteKeepsTheOldFileAndRemovesTheTemporaryOne() throws Exception {
        Path f = dir.resolve("keep.tif");
        Files.writeString(f, "old content");
        assertThatThrownBy(() -> AtomicFiles.write(f, tmp -> {
            Files.writeString(tmp, "half");
            throw new IOException("disk full");
        })).hasMessage("disk full");
        assertThat(Files.readString(f)).isEqualTo("old content");
        assertThat(listing()).containsExactly("keep.tif");
    }

    @Test
    void stoppingTheProgramWhileWritingLeavesNeitherTheTemporaryFileNorANewTarget() throws Exception {
        Path f = dir.resolve("keep.tif");
        Files.writeString(f, "old content");
        assertThatThrownBy(() -> AtomicFiles.write(f, tmp -> {
            Files.writeString(tmp, "half");
            assertThat(listing()).hasSize(2);
            AtomicFiles.removePending(); // what the shutdown hook does on Ctrl-C or SIGTERM
        })).isInstanceOf(IOException.class);
        assertThat(Files.readString(f)).isEqualTo("old content");
        assertThat(listing()).containsExactly("keep.tif");
    }

    @Test
    void replacedFileKeepsItsPermissions() throws Exception {
        Path f = dir.resolve("p.tif");
        Files.writeString(f, "x");
        var perms = java.nio.file.attribute.PosixFilePermissions.fromString("rw-rw-r--");
        Files.setPosixFilePermissions(f, perms);
        MapFiles.write(Fixtures.lifetimeMap(2, 2, 1), f);
        assertThat(Files.getPosixFilePermissions(f)).isEqualTo(perms);
        Path g = dir.resolve("new.tif");
        MapFiles.write(Fixtures.lifetimeMap(2, 2, 1), g);
        assertThat(java.nio.file.attribute.PosixFilePermissions.toString(Files.getPosixFilePermissions(g)))
                .isEqualTo("rw-r--r--");
    }

    private List<String> listing() throws IOException {
        try (Stream<Path> s = Files.list(dir)) {
            return s.map(p -> p.getFileName().toString()).toList();
        }
    }
}
