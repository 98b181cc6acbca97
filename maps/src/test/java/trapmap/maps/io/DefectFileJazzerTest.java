package trapmap.maps.io;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.nio.file.Path;
import org.junit.jupiter.api.Timeout;
import trapmap.maps.fuzz.FuzzContract;

/**
 * Fuzz target of the user defect file reader ({@link DefectFiles#read}): defects or a {@link DefectFileException}
 * with one line naming the file. Seeds:
 * {@code src/test/resources/trapmap/maps/io/DefectFileJazzerTestInputs/readDefectFile/}.
 */
class DefectFileJazzerTest {
    @FuzzTest(maxDuration = "2m")
    @Timeout(10)
    void readDefectFile(byte[] data) throws IOException {
        Path file = FuzzContract.write("defects.json", data);
        try {
            DefectFiles.read(file);
        } catch (DefectFileException e) {
            FuzzContract.oneLineNamingFile(e, file);
        }
    }
}
