package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assumptions.assumeThat;

import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.IronPairRules;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RulesException;
import trapmap.shared.error.InvalidValueException;

class InputFilesTest {
    @TempDir
    Path dir;

    /** A link to /dev/zero, an endless character device; the test is skipped where there is none. */
    private Path zeroLink(String name) throws Exception {
        Path zero = Path.of("/dev/zero");
        assumeThat(Files.exists(zero)).as("/dev/zero exists (Linux)").isTrue();
        return Files.createSymbolicLink(dir.resolve(name), zero);
    }

    /** A named pipe nobody writes to: opening it for reading would block ({@link Fifo}). */
    private Path fifo(String name) throws Exception {
        return Fifo.make(dir.resolve(name));
    }

    @Test
    void aFileWithinTheLimitIsReadWhole() throws Exception {
        Path f = Files.writeString(dir.resolve("ok.json"), "{\"a\": \"µs\"}");
        assertThat(InputFiles.readUtf8(f, 64)).isEqualTo("{\"a\": \"µs\"}");
        assertThat(InputFiles.check(f, 12)).isEqualTo(12);
    }

    @Test
    void aLinkToDevZeroIsRefusedAsNotARegularFileWithoutBeingRead() throws Exception {
        Path link = zeroLink("rules.json");
        assertThatThrownBy(() -> InputFiles.readBytes(link, InputFiles.JSON_MAX_BYTES))
                .isInstanceOf(InputFiles.Refused.class)
                .hasMessage(link + ": is a FIFO, socket or device, not a regular file");
        assertThatThrownBy(() -> Rules.read(link)).isInstanceOf(RulesException.class)
                .hasMessage(link + ": rules file is a FIFO, socket or device, not a regular file");
        assertThatThrownBy(() -> IronPairRules.read(link)).isInstanceOf(RulesException.class)
                .hasMessageStartingWith(link + ": rules file is a FIFO, socket or device, not a regular file");
        assertThatThrownBy(() -> PhysicsSettingsFile.read(link)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining(link + ": physics settings file is a FIFO, socket or device, not a regular file");
        assertThatThrownBy(() -> DefectFiles.read(link)).isInstanceOf(DefectFileException.class)
                .hasMessageContaining(link + ": defect file is a FIFO, socket or device, not a regular file");
        assertThatThrownBy(() -> Sidecar.read(link)).isInstanceOf(MapFormatException.class)
                .hasMessageContaining("not a regular file");
    }

    @Test
    @Timeout(20)
    void aPipeIsRefusedBeforeItIsOpenedSoNothingBlocks() throws Exception {
        Path pipe = fifo("settings.json");
        assertThatThrownBy(() -> InputFiles.readUtf8(pipe, InputFiles.JSON_MAX_BYTES))
                .isInstanceOf(InputFiles.Refused.class).hasMessageContaining("not a regular file");
        assertThatThrownBy(() -> Rules.read(pipe)).isInstanceOf(RulesException.class)
                .hasMessageContaining("not a regular file");
    }

    @Test
    void aFileOverTheLimitIsRefusedNamingItsSizeAndTheLimit() throws Exception {
        Path f = Files.writeString(dir.resolve("big.json"), "[" + "0,".repeat(100) + "0]");
        assertThatThrownBy(() -> InputFiles.readBytes(f, 100)).isInstanceOf(InputFiles.Refused.class)
                .hasMessage(f + ": is 203 bytes, more than the limit of 100 bytes");
        Path rules = dir.resolve("huge-rules.json");
        try (var ch = java.nio.channels.FileChannel.open(rules, StandardOpenOption.CREATE_NEW,
                StandardOpenOption.WRITE, StandardOpenOption.SPARSE)) {
            ch.write(java.nio.ByteBuffer.wrap(new byte[] {' '}), InputFiles.JSON_MAX_BYTES); // one byte too many
        }
        assertThatThrownBy(() -> Rules.read(rules)).isInstanceOf(RulesException.class)
                .hasMessage(rules + ": rules file is 16777217 bytes, more than the limit of 16777216 bytes (16 MB)");
    }

    @Test
    void aFileThatGrowsWhileBeingReadIsCappedAtTheLimit() throws Exception {
        Path f = Files.writeString(dir.resolve("growing.json"), "x".repeat(50));
        try (InputStream in = InputFiles.open(f, 100)) {
            assertThat(in.readNBytes(10)).hasSize(10);
            Files.writeString(f, "y".repeat(200), StandardCharsets.UTF_8, StandardOpenOption.APPEND);
            assertThatThrownBy(in::readAllBytes).isInstanceOf(InputFiles.Refused.class)
                    .hasMessage(f + ": grew to more than the limit of 100 bytes while being read");
        }
    }

    @Test
    void aDirectoryAndAMissingFileAreToldApart() throws Exception {
        assertThatThrownBy(() -> InputFiles.check(dir, 100)).isInstanceOf(InputFiles.Refused.class)
                .hasMessage(dir + ": is a directory, not a regular file");
        assertThatThrownBy(() -> InputFiles.check(dir.resolve("none.json"), 100))
                .isInstanceOf(java.nio.file.NoSuchFileException.class);
    }
}
