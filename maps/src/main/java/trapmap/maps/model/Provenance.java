package trapmap.maps.model;

import java.util.ArrayList;
import java.util.List;

/**
 * Where a map came from: its source file and every processing step since, in order.
 *
 * @param source source file name (or a description for generated maps)
 * @param steps  processing steps, oldest first
 */
public record Provenance(String source, List<ProcessingStep> steps) {
    public Provenance {
        steps = List.copyOf(steps);
    }

    public static Provenance of(String source) {
        return new Provenance(source, List.of());
    }

    /** This history with one more step. */
    public Provenance then(ProcessingStep step) {
        return then(List.of(step));
    }

    /** This history with {@code more} steps appended, in order (one copy, however many steps). */
    public Provenance then(List<ProcessingStep> more) {
        List<ProcessingStep> s = new ArrayList<>(steps.size() + more.size());
        s.addAll(steps);
        s.addAll(more);
        return new Provenance(source, s);
    }
}
