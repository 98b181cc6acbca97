package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assumptions.assumeThat;

import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.InputFiles;

class SessionFileLimitsTest {
    @TempDir
    Path dir;

    @Test
    void aSessionLinkedToDevZeroIsRefusedWithoutBeingRead() throws Exception {
        assumeThat(Files.exists(Path.of("/dev/zero"))).as("/dev/zero exists (Linux)").isTrue();
        Path link = Files.createSymbolicLink(dir.resolve("s.trapmap-session.json"), Path.of("/dev/zero"));
        assertThatThrownBy(() -> SessionFiles.read(link)).isInstanceOf(SessionFiles.SessionException.class)
                .hasMessage(link + ": session file is a FIFO, socket or device, not a regular file");
    }

    @Test
    void aSessionOverTheLimitIsRefusedNamingItsSizeAndTheLimit() throws Exception {
        Path f = dir.resolve("big.json");
        try (FileChannel ch = FileChannel.open(f, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE,
                StandardOpenOption.SPARSE)) {
            ch.write(ByteBuffer.wrap(new byte[] {' '}), InputFiles.JSON_MAX_BYTES);
        }
        assertThatThrownBy(() -> SessionFiles.read(f)).isInstanceOf(SessionFiles.SessionException.class)
                .hasMessage(f + ": session file is 16777217 bytes, more than the limit of 16777216 bytes (16 MB)");
    }
}
