package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.PhysicsSettingsFile;
import trapmap.shared.error.InvalidValueException;

/** A rules or physics settings file that is no text (a map given by mistake) is said to be none, in one line. */
class BinarySettingsFilesTest {
    @TempDir
    Path dir;

    private Path binary() throws Exception {
        Path f = dir.resolve("w01.json");
        Files.write(f, new byte[] {'I', 'I', 42, 0, 8, 0, 0, 0, (byte) 0xfe, (byte) 0xff, (byte) 0x80});
        return f;
    }

    @Test
    void aBinaryRulesFileIsSaidToBeNoUtf8Text() throws Exception {
        Path f = binary();
        assertThatThrownBy(() -> Rules.read(f)).isInstanceOf(RulesException.class)
                .hasMessage(f + ": rules file is not UTF-8 text");
    }

    @Test
    void aBinaryPhysicsFileIsSaidToBeNoUtf8Text() throws Exception {
        Path f = binary();
        assertThatThrownBy(() -> PhysicsSettingsFile.read(f)).isInstanceOf(InvalidValueException.class)
                .hasMessage(f + ": physics settings file is not UTF-8 text");
    }
}
