package trapmap.cli;

import java.io.PrintWriter;
import java.util.Locale;
import trapmap.maps.batch.BatchInspection;

/**
 * The times of the parts of an {@code inspect} run, printed to the error stream as one line when the Java system
 * property {@value #PROPERTY} is {@code true} ({@code JAVA_OPTS=-Dtrapmap.phaseTimes=true}), for
 * {@code scripts/bench-inspect}: the wall-clock milliseconds since the epoch when the command started and ended
 * (so that a caller that knows when it started the process gets the start-up and the exit), and the milliseconds
 * of each part of the batch ({@link BatchInspection.Phases}).
 */
final class PhaseTimes {
    static final String PROPERTY = "trapmap.phaseTimes";

    private PhaseTimes() {
    }

    static boolean wanted() {
        return Boolean.getBoolean(PROPERTY);
    }

    /**
     * One line: {@code inspect phase times: call_start_ms=… start_process_cpu_ms=… start_cpu_ms=… prepare_ms=…
     * inspection_ms=… tables_ms=… summary_ms=… writer_busy_ms=… prepare_cpu_ms=… tables_cpu_ms=… summary_cpu_ms=…
     * worker_cpu_ms=… inspection_cpu_ms=… end_cpu_ms=… call_end_ms=…}, where {@code start_process_cpu_ms} is the process's CPU time (all threads) when the command
     * started, {@code start_cpu_ms} that of the command's thread (which started the JVM) and the other
     * {@code _cpu_ms} figures that thread's CPU time in the phase (in the inspection: writing rows beside the
     * workers), {@code worker_cpu_ms} the workers' CPU time in all, and {@code end_cpu_ms} the command thread's CPU
     * time at the end, JVM start included (-1: not known). All the command thread's CPU time but that in the
     * inspection is serial: {@code end_cpu_ms - inspection_cpu_ms}. {@code before_batch_ms} and
     * {@code before_batch_cpu_ms}: the command's own steps before the batch starts (reading the rules, listing the
     * inputs), wall and the command thread's CPU time; {@code summary_draft_cpu_ms}: the CPU time of the thread that
     * draws the summary beside the workers ({@code SummaryDraft}; -1: none), of which {@code summary_finishing_cpu_ms}
     * after the last row (finishing the summary beside the tables: serial work of the run, on another thread).
     */
    static String line(long callStartEpochMs, long startProcessCpuNanos, long startCpuNanos, BatchInspection.Phases p,
                       Steps steps, long endCpuNanos, long callEndEpochMs) {
        return String.format(Locale.ROOT, "inspect phase times: call_start_ms=%d start_process_cpu_ms=%.1f"
                        + " start_cpu_ms=%.1f prepare_ms=%.1f inspection_ms=%.1f tables_ms=%.1f summary_ms=%.1f"
                        + " writer_busy_ms=%.1f prepare_cpu_ms=%.1f tables_cpu_ms=%.1f summary_cpu_ms=%.1f"
                        + " worker_cpu_ms=%.1f inspection_cpu_ms=%.1f before_batch_ms=%.1f before_batch_cpu_ms=%.1f"
                        + " summary_draft_cpu_ms=%.1f summary_finishing_cpu_ms=%.1f end_cpu_ms=%.1f call_end_ms=%d",
                callStartEpochMs, ms(startProcessCpuNanos), ms(startCpuNanos), ms(p.prepareNanos()),
                ms(p.inspectionNanos()),
                ms(p.tablesNanos()), ms(p.summaryNanos()), ms(p.writerBusyNanos()), ms(p.prepareCpuNanos()),
                ms(p.tablesCpuNanos()), ms(p.summaryCpuNanos()), ms(p.workerCpuNanos()), ms(p.inspectionCpuNanos()),
                ms(steps.beforeBatchNanos()), ms(steps.beforeBatchCpuNanos()), ms(steps.summaryDraftCpuNanos()),
                ms(steps.summaryFinishingCpuNanos()), ms(endCpuNanos), callEndEpochMs);
    }

    /**
     * The command's own parts of the line: its steps before the batch (wall and its thread's CPU, ns), the summary
     * drawing thread's CPU time and the part of it after the last row (ns, -1: none).
     */
    record Steps(long beforeBatchNanos, long beforeBatchCpuNanos, long summaryDraftCpuNanos,
                 long summaryFinishingCpuNanos) {
        static final Steps NONE = new Steps(-1, -1, -1, -1);
    }

    private static double ms(long nanos) {
        return nanos < 0 ? -1 : nanos / 1e6;
    }

    /** The process's and this thread's CPU time now, when wanted (else -1s). */
    static long[] startCpu() {
        return wanted() ? new long[] {BatchInspection.processCpuNanos(), BatchInspection.threadCpuNanos()}
                : new long[] {-1, -1};
    }

    static void print(PrintWriter err, long callStartEpochMs, long[] startCpu, BatchInspection.Phases p,
                      Steps steps) {
        if (wanted()) {
            err.println(line(callStartEpochMs, startCpu[0], startCpu[1], p, steps, BatchInspection.threadCpuNanos(),
                    System.currentTimeMillis()));
            err.flush();
        }
    }
}
