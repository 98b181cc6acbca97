package trapmap.maps.io;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.nio.file.Path;
import org.junit.jupiter.api.Timeout;
import trapmap.maps.fuzz.FuzzContract;
import trapmap.shared.error.InvalidValueException;

/**
 * Fuzz target of the physics settings file reader ({@link PhysicsSettingsFile#read}): settings or an
 * {@link InvalidValueException} with one line naming the file. Seeds:
 * {@code src/test/resources/trapmap/maps/io/PhysicsSettingsJazzerTestInputs/readPhysicsSettings/}.
 */
class PhysicsSettingsJazzerTest {
    @FuzzTest(maxDuration = "2m")
    @Timeout(10)
    void readPhysicsSettings(byte[] data) throws IOException {
        Path file = FuzzContract.write("physics.json", data);
        try {
            PhysicsSettingsFile.read(file);
        } catch (InvalidValueException e) {
            FuzzContract.oneLineNamingFile(e, file);
        }
    }
}
