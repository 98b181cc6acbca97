package trapmap.maps.process;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatCode;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicReference;
import org.junit.jupiter.api.Test;

/** The workers of a whole-map pass: every task runs once, the first on the calling thread; failures come back. */
class WorkersTest {
    @Test
    void everyTaskRunsOnceTheFirstOnTheCallingThreadTheOthersOnNamedThreads() {
        Set<String> threads = ConcurrentHashMap.newKeySet();
        List<Runnable> tasks = new ArrayList<>();
        int[] runs = new int[4];
        for (int t = 0; t < runs.length; t++) {
            int index = t;
            tasks.add(() -> {
                runs[index]++;
                threads.add(Thread.currentThread().getName());
            });
        }
        AtomicReference<Throwable> failure = new AtomicReference<>();
        assertThat(Workers.runAll(tasks, "pass-", failure)).isNull();
        assertThat(runs).containsExactly(1, 1, 1, 1);
        assertThat(threads).containsExactlyInAnyOrder(Thread.currentThread().getName(), "pass-1", "pass-2",
                "pass-3");
    }

    @Test
    void theFirstRecordedFailureIsReturnedAndRethrownAsItIs() {
        IllegalArgumentException boom = new IllegalArgumentException("bad pixel");
        AtomicReference<Throwable> failure = new AtomicReference<>();
        Runnable failing = () -> failure.compareAndSet(null, boom);
        Throwable f = Workers.runAll(Collections.nCopies(3, failing), "fail-", failure);
        assertThat(f).isSameAs(boom);
        assertThatThrownBy(() -> Workers.rethrow(f, "the pass was interrupted")).isSameAs(boom);
        AssertionError error = new AssertionError("broken");
        assertThatThrownBy(() -> Workers.rethrow(error, "x")).isSameAs(error);
    }

    @Test
    void anInterruptIsWrappedWithTheMessageAndNoFailureIsNothing() {
        InterruptedException interrupt = new InterruptedException();
        assertThatThrownBy(() -> Workers.rethrow(interrupt, "the pass was interrupted"))
                .isInstanceOf(IllegalStateException.class).hasMessage("the pass was interrupted")
                .hasCause(interrupt);
        assertThatCode(() -> Workers.rethrow(null, "x")).doesNotThrowAnyException();
    }
}
