package trapmap.maps.watch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@link SignalLedger}: a new ledger takes the folder's maps as looked at; additions survive a reopening. */
class SignalLedgerTest {
    @Test
    void aNewLedgerTakesTheListedMapsAsLookedAtAndAdditionsAreKept(@TempDir Path out) throws Exception {
        SignalLedger l = SignalLedger.open(out, List.of("/in/A.tif", "/in/B.tif"));
        assertThat(out.resolve(SignalLedger.FILE_NAME)).exists();
        List<String> now = List.of("/in/A.tif", "/in/B.tif", "/in/C.tif", "/in/D.tif");
        assertThat(l.pending(now)).containsExactly("/in/C.tif", "/in/D.tif");
        l.add(List.of("/in/C.tif"));

        SignalLedger again = SignalLedger.open(out, now); // exists: the listed maps are not taken as looked at
        assertThat(again.pending(now)).containsExactly("/in/D.tif");
        assertThat(Files.readAllLines(out.resolve(SignalLedger.FILE_NAME)))
                .containsExactly("/in/A.tif", "/in/B.tif", "/in/C.tif");
    }

    @Test
    void aFolderWithoutMapsStartsAnEmptyLedger(@TempDir Path out) throws Exception {
        SignalLedger l = SignalLedger.open(out, List.of());
        assertThat(l.pending(List.of("/in/A.tif"))).containsExactly("/in/A.tif");
        assertThat(Files.readString(out.resolve(SignalLedger.FILE_NAME))).isEmpty();
    }
}
