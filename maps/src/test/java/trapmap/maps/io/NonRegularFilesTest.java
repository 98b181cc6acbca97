package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/**
 * Maps and sidecars that are not plain readable files: FIFOs (never opened, since opening one waits for a writer),
 * directories and files without read permission are named as such.
 */
class NonRegularFilesTest {
    @TempDir
    Path dir;

    /** A FIFO in the test folder ({@link Fifo}). */
    private Path fifo(String name) throws Exception {
        return Fifo.make(dir.resolve(name));
    }

    private Path plainTiff(String name) throws Exception {
        Path f = dir.resolve(name);
        Files.write(f, SidecarTest.plainTiff());
        return f;
    }

    @Test
    @Timeout(value = 30, unit = TimeUnit.SECONDS) // opening the FIFO would block here
    void fifoAsMapIsNotARegularFile() throws Exception {
        Path f = fifo("w01.tif");
        assertThatThrownBy(() -> MapFiles.read(f))
                .hasMessage(f + ": is a FIFO, socket or device, not a regular file");
    }

    @Test
    void deviceAsMapIsNotARegularFile() {
        Path dev = Path.of("/dev/null");
        assumeTrue(Files.exists(dev));
        assertThatThrownBy(() -> MapFiles.read(dev))
                .hasMessage(dev + ": is a FIFO, socket or device, not a regular file");
    }

    @Test
    void directoryAsMapIsNotARegularFile() throws Exception {
        Path d = Files.createDirectory(dir.resolve("w02.tif"));
        assertThatThrownBy(() -> MapFiles.read(d)).hasMessage(d + ": is a directory, not a regular file");
    }

    @Test
    @Timeout(value = 30, unit = TimeUnit.SECONDS)
    void fifoAsSidecarIsAnErrorNamingTheSidecar() throws Exception {
        Path map = plainTiff("w03.tif");
        Path sidecar = fifo("w03.json");
        assertThatThrownBy(() -> MapFiles.read(map)).isInstanceOf(MapFormatException.class)
                .hasMessage(sidecar + ": the sidecar of w03.tif is a FIFO, socket or device, not a regular file;"
                        + " remove or rename it");
    }

    @Test
    void directoryAsSidecarIsAnErrorNamingTheSidecar() throws Exception {
        Path map = plainTiff("w04.tif");
        Path sidecar = Files.createDirectory(dir.resolve("w04.json"));
        assertThatThrownBy(() -> MapFiles.read(map)).hasMessage(sidecar + ": the sidecar of w04.tif is a"
                + " directory, not a regular file; remove or rename it");
    }

    @Test
    void unreadableMapSaysPermissionDenied() throws Exception {
        Path map = plainTiff("w05.tif");
        Files.setPosixFilePermissions(map, PosixFilePermissions.fromString("-w-------"));
        assumeTrue(!Files.isReadable(map), "running with rights that read any file (root)");
        assertThatThrownBy(() -> MapFiles.read(map)).hasMessage(map + ": permission denied");
    }

    @Test
    void unreadableSidecarSaysPermissionDenied() throws Exception {
        Path map = plainTiff("w06.tif");
        Path sidecar = dir.resolve("w06.json");
        Files.writeString(sidecar, "{}");
        Files.setPosixFilePermissions(sidecar, PosixFilePermissions.fromString("-w-------"));
        assumeTrue(!Files.isReadable(sidecar), "running with rights that read any file (root)");
        assertThatThrownBy(() -> MapFiles.read(map))
                .hasMessage(sidecar + ": the sidecar of w06.tif cannot be read: permission denied");
    }
}
