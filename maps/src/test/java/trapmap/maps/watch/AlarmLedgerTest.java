package trapmap.maps.watch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@link AlarmLedger}: a new ledger takes the folder's maps as dealt with; additions survive a reopening; alarms
 * recorded with their maps stay pending (across a reopening, as after a kill) until raised.
 */
class AlarmLedgerTest {
    private static final Instant T = Instant.parse("2026-12-05T13:47:39Z");

    @Test
    void aNewLedgerTakesTheListedMapsAsLookedAtAndAdditionsAreKept(@TempDir Path out) throws Exception {
        AlarmLedger l = AlarmLedger.open(out, AlarmLedger.SIGNALS, List.of("/in/A.tif", "/in/B.tif"));
        assertThat(out.resolve(AlarmLedger.SIGNALS)).exists();
        List<String> now = List.of("/in/A.tif", "/in/B.tif", "/in/C.tif", "/in/D.tif");
        assertThat(l.pending(now)).containsExactly("/in/C.tif", "/in/D.tif");
        l.add(List.of("/in/C.tif"));

        AlarmLedger again = AlarmLedger.open(out, AlarmLedger.SIGNALS, now); // exists: listed not taken as looked at
        assertThat(again.pending(now)).containsExactly("/in/D.tif");
        assertThat(again.pendingAlarms()).isEmpty();
        assertThat(Files.readAllLines(out.resolve(AlarmLedger.SIGNALS)))
                .containsExactly("/in/A.tif", "/in/B.tif", "/in/C.tif");
    }

    @Test
    void aFolderWithoutMapsStartsAnEmptyLedger(@TempDir Path out) throws Exception {
        AlarmLedger l = AlarmLedger.open(out, AlarmLedger.FAILURES, List.of());
        assertThat(l.pending(List.of("/in/A.tif"))).containsExactly("/in/A.tif");
        assertThat(Files.readString(out.resolve(AlarmLedger.FAILURES))).isEmpty();
    }

    @Test
    void alarmsRecordedWithTheirMapsStayPendingAcrossAReopeningUntilRaised(@TempDir Path out) throws Exception {
        AlarmLedger l = AlarmLedger.open(out, AlarmLedger.SIGNALS, List.of("/in/A.tif"));
        // an id and a group with the characters a line or CSV format could trip on
        Alarm.Raising s = Alarm.Raising.signal(T, "W,\"7\"", "beyond_3_sigma", "T2\nx", "trap_density_p50_cm3");
        Alarm.Raising f = Alarm.Raising.wafer(T.plusSeconds(1), "W08", "fail", "/in/W 08.tif");
        l.add(List.of("/in/W7.tif", "/in/W8.tif"), List.of(s, f));

        // killed now: the next start finds both maps recorded and both alarms pending, as they were
        AlarmLedger killed = AlarmLedger.open(out, AlarmLedger.SIGNALS, List.of());
        assertThat(killed.pending(List.of("/in/A.tif", "/in/W7.tif", "/in/W8.tif", "/in/W9.tif")))
                .containsExactly("/in/W9.tif");
        assertThat(killed.pendingAlarms()).containsExactly(s, f);
        assertThat(killed.pendingAlarms().get(0).args()).containsExactly("signal", "beyond_3_sigma", "T2\nx",
                "trap_density_p50_cm3");

        killed.raised(s);
        assertThat(AlarmLedger.open(out, AlarmLedger.SIGNALS, List.of()).pendingAlarms()).containsExactly(f);
        killed.raised(f);
        assertThat(AlarmLedger.open(out, AlarmLedger.SIGNALS, List.of()).pendingAlarms()).isEmpty();
        assertThat(Files.readAllLines(out.resolve(AlarmLedger.SIGNALS)))
                .containsExactly("/in/A.tif", "/in/W7.tif", "/in/W8.tif");
    }

    @Test
    void aDamagedPendingAlarmIsToldWithTheFile(@TempDir Path out) throws Exception {
        Files.writeString(out.resolve(AlarmLedger.FAILURES), "/in/A.tif\n\nyesterday,W1,/in/A.tif,fail\n");
        assertThatThrownBy(() -> AlarmLedger.open(out, AlarmLedger.FAILURES, List.of()))
                .isInstanceOf(IOException.class).hasMessageContaining(AlarmLedger.FAILURES)
                .hasMessageContaining("TIME").hasMessageContaining("yesterday");
    }
}
