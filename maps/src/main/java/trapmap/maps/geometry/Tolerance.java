package trapmap.maps.geometry;

import trapmap.shared.check.Checks;

/**
 * An allowed deviation from a nominal dimension: the value may lie in [nominal − minus, nominal + plus].
 *
 * @param minus allowed shortfall (≥ 0), in the unit of the dimension
 * @param plus  allowed excess (≥ 0), in the unit of the dimension
 */
public record Tolerance(double minus, double plus) {
    public Tolerance {
        Checks.nonNegative(minus, "toleranceMinus", "");
        Checks.nonNegative(plus, "tolerancePlus", "");
    }

    /** ± {@code value}. */
    public static Tolerance symmetric(double value) {
        return new Tolerance(value, value);
    }

    /** True when {@code actual} lies within this tolerance of {@code nominal}. */
    public boolean accepts(double nominal, double actual) {
        return actual >= nominal - minus && actual <= nominal + plus;
    }

    @Override
    public String toString() {
        return minus == plus ? "±" + plus : "+" + plus + "/−" + minus;
    }
}
