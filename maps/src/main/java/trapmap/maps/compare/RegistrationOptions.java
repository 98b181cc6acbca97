package trapmap.maps.compare;

import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * How hard {@link MapRegistration} searches.
 *
 * @param searchOrientations try all eight mirror/quarter-turn placements (otherwise B is assumed upright)
 * @param maxRotationDeg     largest fine turn on either side of each mirror/quarter-turn placement, degrees (0:
 *                           none); every stage, the refinement included, keeps within it
 * @param rotationStepDeg    step of the coarse fine-turn scan, degrees; refined continuously afterwards
 * @param coarseSizePx       side of the square search image for the exhaustive stages, pixels (power of two)
 * @param refineSizePx       largest number of pixels across the wafer used for the final refinement; larger maps
 *                           are refined at a reduced resolution
 */
public record RegistrationOptions(boolean searchOrientations, double maxRotationDeg, double rotationStepDeg,
                                  int coarseSizePx, int refineSizePx) {

    /** All orientations, ±5° fine turn in 1° steps, 128-pixel search image, refinement up to 512 pixels. */
    public static final RegistrationOptions DEFAULTS = new RegistrationOptions(true, 5, 1, 128, 512);

    public RegistrationOptions {
        Checks.inRange(maxRotationDeg, 0, 45, "maxRotation", "deg");
        Checks.inRange(rotationStepDeg, 0.05, 10, "rotationStep", "deg");
        if (coarseSizePx < 32 || coarseSizePx > 2048 || Integer.bitCount(coarseSizePx) != 1) {
            throw new InvalidValueException("coarseSize", "px", "coarseSize must be a power of two in [32, 2048] px"
                    + " but was " + coarseSizePx);
        }
        if (refineSizePx < 32 || refineSizePx > 16384) {
            throw new InvalidValueException("refineSize", "px", "refineSize must be in [32, 16384] px but was "
                    + refineSizePx);
        }
    }

    /** These options, searching orientations or not. */
    public RegistrationOptions withSearchOrientations(boolean search) {
        return new RegistrationOptions(search, maxRotationDeg, rotationStepDeg, coarseSizePx, refineSizePx);
    }

    /** These options with another fine-turn range, degrees. */
    public RegistrationOptions withMaxRotation(double deg) {
        return new RegistrationOptions(searchOrientations, deg, rotationStepDeg, coarseSizePx, refineSizePx);
    }

    /** These options with another refinement resolution, pixels across the wafer. */
    public RegistrationOptions withRefineSize(int px) {
        return new RegistrationOptions(searchOrientations, maxRotationDeg, rotationStepDeg, coarseSizePx, px);
    }
}
