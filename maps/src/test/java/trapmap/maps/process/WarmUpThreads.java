package trapmap.maps.process;

import static org.assertj.core.api.Assertions.assertThat;

/** Tests' check that the conversion's warm-up threads ({@link BandConversion#WARM_UP_THREAD}) have ended. */
public final class WarmUpThreads {
    private WarmUpThreads() {
    }

    /** Waits up to 10 s for every warm-up thread to end, then asserts that none is left. */
    public static void assertAllEnd() throws InterruptedException {
        long until = System.nanoTime() + 10_000_000_000L;
        while (running() > 0 && System.nanoTime() < until) {
            Thread.sleep(10);
        }
        assertThat(running()).as("warm-up threads still running").isZero();
    }

    private static long running() {
        return Thread.getAllStackTraces().keySet().stream()
                .filter(t -> t.getName().equals(BandConversion.WARM_UP_THREAD)).count();
    }
}
