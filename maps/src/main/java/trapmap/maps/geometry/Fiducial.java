package trapmap.maps.geometry;

import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * The orientation mark on the rim of a round wafer: none, a primary flat or a V-shaped notch. Dimensions only; where
 * the mark sits is the {@code fiducialAngleDeg} of {@link RoundWafer}.
 */
public sealed interface Fiducial permits Fiducial.None, Fiducial.Flat, Fiducial.Notch {

    /** No mark: a plain disk. */
    None NONE = new None();

    /** Short name used in format ids and reports: {@code none}, {@code flat}, {@code notch}. */
    String kind();

    static Flat flat(double lengthMm) {
        return new Flat(lengthMm);
    }

    static Notch notch(double depthMm, double openingAngleDeg) {
        return new Notch(depthMm, openingAngleDeg);
    }

    /** A plain disk. */
    record None() implements Fiducial {
        @Override
        public String kind() {
            return "none";
        }
    }

    /**
     * A straight primary flat: a chord of the wafer circle.
     *
     * @param lengthMm chord length, mm (must be shorter than the diameter)
     */
    record Flat(double lengthMm) implements Fiducial {
        public Flat {
            Checks.positive(lengthMm, "flatLength", "mm");
        }

        @Override
        public String kind() {
            return "flat";
        }
    }

    /**
     * A V-shaped notch cut radially into the rim. The rounded bottom of a real notch (it seats a 3 mm alignment pin)
     * is not modelled: at map resolutions it is below one pixel.
     *
     * @param depthMm         depth from the circle to the bottom of the V, mm
     * @param openingAngleDeg full angle between the two sides of the V, degrees (0, 180)
     */
    record Notch(double depthMm, double openingAngleDeg) implements Fiducial {
        public Notch {
            Checks.positive(depthMm, "notchDepth", "mm");
            if (!(openingAngleDeg > 0 && openingAngleDeg < 180)) {
                throw new InvalidValueException("notchAngle", "deg",
                        "notchAngle must be in (0, 180) deg but was " + openingAngleDeg);
            }
        }

        @Override
        public String kind() {
            return "notch";
        }
    }
}
