package trapmap.physics.conversion;

import trapmap.shared.check.Checks;

/** How the excess carrier density of a pixel is known. */
public sealed interface Injection permits Injection.Fixed, Injection.Generation {

    /** The same excess carrier density Δn at every pixel, cm^-3. */
    record Fixed(double excessPerCm3) implements Injection {
        /** Smallest excess carrier density accepted, cm^-3. */
        public static final double MIN_EXCESS_PER_CM3 = 1e6;
        /** Largest excess carrier density accepted, cm^-3. */
        public static final double MAX_EXCESS_PER_CM3 = 1e19;

        public Fixed {
            Checks.inRange(excessPerCm3, MIN_EXCESS_PER_CM3, MAX_EXCESS_PER_CM3, "injection", "cm^-3");
        }

        /** The generated record text, written out (see {@link Surface#toString()}). */
        @Override
        public String toString() {
            return "Fixed[excessPerCm3=" + excessPerCm3 + "]";
        }
    }

    /** A uniform steady-state generation rate G; each pixel has Δn = G·τ_eff. */
    record Generation(double ratePerCm3PerS) implements Injection {
        /** Smallest generation rate accepted, cm^-3 s^-1. */
        public static final double MIN_RATE_PER_CM3_PER_S = 1e10;
        /** Largest generation rate accepted, cm^-3 s^-1. */
        public static final double MAX_RATE_PER_CM3_PER_S = 1e24;

        public Generation {
            Checks.inRange(ratePerCm3PerS, MIN_RATE_PER_CM3_PER_S, MAX_RATE_PER_CM3_PER_S, "generation",
                    "cm^-3 s^-1");
        }

        /** The generated record text, written out (see {@link Surface#toString()}). */
        @Override
        public String toString() {
            return "Generation[ratePerCm3PerS=" + ratePerCm3PerS + "]";
        }
    }

    static Injection fixed(double excessPerCm3) {
        return new Fixed(excessPerCm3);
    }

    static Injection generation(double ratePerCm3PerS) {
        return new Generation(ratePerCm3PerS);
    }
}
