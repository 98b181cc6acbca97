package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.util.LinkedHashMap;
import java.util.Map;
import org.junit.jupiter.api.Test;
import trapmap.maps.batch.BatchInspection;

class PhaseTimesTest {
    /** The line's key=value fields, as scripts/bench-inspect reads them. */
    private static Map<String, String> fields(String line) {
        assertThat(line).startsWith("inspect phase times: ");
        Map<String, String> m = new LinkedHashMap<>();
        for (String kv : line.substring("inspect phase times: ".length()).split(" ")) {
            String[] p = kv.split("=", 2);
            m.put(p[0], p[1]);
        }
        return m;
    }

    @Test
    void everyPhaseIsOneKeyValueFieldInMillisecondsAndAnUnknownCpuTimeIsMinusOne() {
        BatchInspection.Phases p = new BatchInspection.Phases(2_500_000, 1_234_500_000, 40_000_000, 750_000_000,
                12_000_000, 1_000_000, -1, 600_000_000, 2_000_000_000, 11_000_000);
        Map<String, String> f = fields(PhaseTimes.line(1_000, 300_000_000, 250_000_000, p,
                new PhaseTimes.Steps(180_000_000, 170_000_000, 520_000_000, 95_000_000), 900_000_000, 3_000));
        assertThat(f).containsExactly(Map.entry("call_start_ms", "1000"), Map.entry("start_process_cpu_ms", "300.0"),
                Map.entry("start_cpu_ms", "250.0"), Map.entry("prepare_ms", "2.5"),
                Map.entry("inspection_ms", "1234.5"), Map.entry("tables_ms", "40.0"),
                Map.entry("summary_ms", "750.0"), Map.entry("writer_busy_ms", "12.0"),
                Map.entry("prepare_cpu_ms", "1.0"), Map.entry("tables_cpu_ms", "-1.0"),
                Map.entry("summary_cpu_ms", "600.0"), Map.entry("worker_cpu_ms", "2000.0"),
                Map.entry("inspection_cpu_ms", "11.0"), Map.entry("before_batch_ms", "180.0"),
                Map.entry("before_batch_cpu_ms", "170.0"), Map.entry("summary_draft_cpu_ms", "520.0"),
                Map.entry("summary_finishing_cpu_ms", "95.0"), Map.entry("end_cpu_ms", "900.0"),
                Map.entry("call_end_ms", "3000"));
    }

    @Test
    void theThreadsCpuTimeGrowsWithWorkWhereTheSystemTellsIt() {
        long before = BatchInspection.threadCpuNanos();
        assumeTrue(before >= 0, "the thread's CPU time is read from Linux's /proc/thread-self/schedstat");
        double x = 0;
        for (int i = 0; i < 20_000_000; i++) {
            x += Math.sqrt(i);
        }
        assertThat(x).isPositive();
        assertThat(BatchInspection.threadCpuNanos()).isGreaterThan(before);
        assertThat(BatchInspection.processCpuNanos()).isGreaterThanOrEqualTo(0);
    }
}
