package trapmap.cli;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.function.Supplier;
import trapmap.maps.io.Rendering;

/**
 * The picture and PDF steps of one command and what this Java runtime allows of them ({@link Rendering}): the runtime
 * is asked once, when the first step that draws text is due, and a step it cannot run is skipped and named; a step
 * that fails anyway with a missing library, font or display (the probe passed but the step's own drawing failed) is
 * caught at its boundary and counted the same way. {@link #line()} is then the one line that names the skipped steps,
 * what is missing and what to install; the command exits with {@link Exit#REPORT_MISSING}.
 */
final class Pictures {
    /** The real runtime's answer, probed once per process. */
    static final Supplier<Optional<Rendering.Missing>> RUNTIME = Rendering::missing;
    /** The runtime's answer ({@link #RUNTIME}); a test puts a failing probe here. */
    static volatile Supplier<Optional<Rendering.Missing>> runtime = RUNTIME;

    /** A step that draws: a picture, a chart or a PDF. */
    @FunctionalInterface
    interface Step {
        void run() throws IOException;
    }

    private final List<String> skipped = new ArrayList<>();
    private Optional<Rendering.Missing> answer;
    private Rendering.Missing missing;

    /** The picture steps of one command run; the runtime is asked when the first is due. */
    static Pictures start() {
        return new Pictures();
    }

    /** What the runtime lacks to draw text, asked once; empty when it draws. */
    synchronized Optional<Rendering.Missing> missing() {
        if (answer == null) {
            answer = runtime.get();
        }
        return answer;
    }

    /**
     * Whether {@code step} (named as the message names it: "summary.pdf", "the recurrence pictures") may run: false
     * when the runtime cannot draw text; the step is then recorded as skipped.
     */
    synchronized boolean allows(String step) {
        Optional<Rendering.Missing> m = missing();
        if (m.isEmpty()) {
            return true;
        }
        skip(step, m.get());
        return false;
    }

    /**
     * Runs {@code step} when the runtime allows it; a failure of the step that says a library, font or display is
     * missing skips it instead of ending the command. Returns whether the step ran to its end.
     */
    boolean run(String step, Step body) throws IOException {
        if (!allows(step)) {
            return false;
        }
        try {
            body.run();
            return true;
        } catch (RuntimeException | Error e) {
            Optional<Rendering.Missing> m = Rendering.failure(e);
            if (m.isEmpty() || e instanceof VirtualMachineError) {
                throw e;
            }
            synchronized (this) {
                skip(step, m.get());
            }
            return false;
        }
    }

    private void skip(String step, Rendering.Missing m) {
        if (missing == null) {
            missing = m;
        }
        if (!skipped.contains(step)) {
            skipped.add(step);
        }
    }

    /** Whether {@code step} was skipped. */
    synchronized boolean skipped(String step) {
        return skipped.contains(step);
    }

    /** What was missing, one line ({@link Rendering.Missing#text()}), or null when nothing was skipped. */
    synchronized String missingText() {
        return missing == null ? null : missing.text();
    }

    /**
     * The one line about the skipped steps ("summary.pdf and the recurrence pictures were not made: this Java
     * runtime cannot draw text (…); install …"), or empty when none was skipped.
     */
    synchronized Optional<String> line() {
        if (skipped.isEmpty()) {
            return Optional.empty();
        }
        String steps = skipped.size() == 1 ? skipped.get(0)
                : String.join(", ", skipped.subList(0, skipped.size() - 1)) + " and " + skipped.get(skipped.size() - 1);
        return Optional.of(steps + (skipped.size() == 1 && !steps.startsWith("the ") ? " was" : " were")
                + " not made: " + missing.text());
    }

    /** A picture that is a command's output could not be made: exit {@link Exit#REPORT_MISSING}, one line. */
    static final class NotMade extends RuntimeException {
        private static final long serialVersionUID = 1L;

        NotMade(String message) {
            super(message);
        }
    }
}
