package trapmap.maps.compare;

import java.util.Optional;
import trapmap.maps.model.Quantity;
import trapmap.shared.error.InvalidValueException;

/** Which way a quantity moves when the material gets better. */
public enum Improvement {
    /** Lifetimes, PL signal, injection at fixed generation. */
    HIGHER_IS_BETTER,
    /** Trap, iron and normalised defect densities. */
    LOWER_IS_BETTER;

    /** The direction for {@code q}, empty when the quantity has none (differences, ratios, occupancy, status…). */
    public static Optional<Improvement> forQuantity(Quantity q) {
        return switch (q) {
            case EFFECTIVE_LIFETIME, SRH_LIFETIME, LIFETIME_AT_REFERENCE, PL_COUNTS, INJECTION ->
                    Optional.of(HIGHER_IS_BETTER);
            case TRAP_DENSITY, TRAP_DENSITY_MIN, TRAP_DENSITY_MAX, IRON_DENSITY, NORMALISED_DENSITY ->
                    Optional.of(LOWER_IS_BETTER);
            default -> Optional.empty();
        };
    }

    /**
     * The direction for {@code q}.
     *
     * @throws InvalidValueException when the quantity has none; the caller must then say which way is better
     */
    public static Improvement of(Quantity q) {
        return forQuantity(q).orElseThrow(() -> new InvalidValueException("improvement", "", "a "
                + q.key() + " map has no better direction; say whether higher or lower values are better"));
    }

    /** True when {@code a} and {@code b} both have a direction and the directions differ (lifetime vs density). */
    static boolean opposite(Quantity a, Quantity b) {
        Optional<Improvement> da = forQuantity(a);
        Optional<Improvement> db = forQuantity(b);
        return da.isPresent() && db.isPresent() && da.get() != db.get();
    }
}
