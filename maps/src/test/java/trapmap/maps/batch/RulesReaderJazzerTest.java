package trapmap.maps.batch;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.nio.file.Path;
import org.junit.jupiter.api.Timeout;
import trapmap.maps.fuzz.FuzzContract;

/**
 * Fuzz target of the rules reader, as {@code trapmap inspect} reads a rules file: {@link Rules#read} and then
 * {@link IronPairRules#read}. Rules or a {@link RulesException} with one line naming the file. Seeds and fixed
 * findings: {@code src/test/resources/trapmap/maps/batch/RulesReaderJazzerTestInputs/readRules/}.
 */
class RulesReaderJazzerTest {
    @FuzzTest(maxDuration = "2m")
    @Timeout(10)
    void readRules(byte[] data) throws IOException {
        Path file = FuzzContract.write("rules.json", data);
        try {
            Rules.read(file);
            IronPairRules.read(file);
        } catch (RulesException e) {
            FuzzContract.oneLineNamingFile(e, file);
        }
    }
}
