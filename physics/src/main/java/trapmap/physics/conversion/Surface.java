package trapmap.physics.conversion;

import trapmap.physics.recombination.SurfaceModel;
import trapmap.shared.check.Checks;

/**
 * Surface passivation of a wafer: thickness and an equal recombination velocity on both surfaces.
 *
 * @param thicknessUm wafer thickness W, µm
 * @param srvCmPerS   surface recombination velocity S, cm/s (0 = ideal surfaces)
 * @param model       surface-lifetime model
 */
public record Surface(double thicknessUm, double srvCmPerS, SurfaceModel model) {
    /** Ideal surfaces: no surface recombination term. */
    public static final Surface IDEAL = new Surface(Double.NaN, 0, SurfaceModel.SPROUL);
    /** Thinnest wafer accepted, µm. */
    public static final double MIN_THICKNESS_UM = 1;
    /** Thickest wafer accepted, µm. */
    public static final double MAX_THICKNESS_UM = 5000;
    /** Largest surface recombination velocity accepted, cm/s. */
    public static final double MAX_SRV_CM_PER_S = 1e7;

    public Surface {
        Checks.notNull(model, "surface model");
        if (srvCmPerS != 0 || !Double.isNaN(thicknessUm)) {
            Checks.inRange(thicknessUm, MIN_THICKNESS_UM, MAX_THICKNESS_UM, "thickness", "um");
            Checks.inRange(srvCmPerS, 0, MAX_SRV_CM_PER_S, "surfaceRecombinationVelocity", "cm/s");
        }
    }

    /** Sproul-approximated surfaces of velocity {@code srvCmPerS} on a wafer {@code thicknessUm} thick. */
    public static Surface sproul(double thicknessUm, double srvCmPerS) {
        return new Surface(thicknessUm, srvCmPerS, SurfaceModel.SPROUL);
    }

    /** True when there is no surface term. */
    public boolean ideal() {
        return srvCmPerS == 0;
    }

    /**
     * The text a record's generated {@code toString} gives ({@code Surface[thicknessUm=180.0, srvCmPerS=10.0,
     * model=SPROUL]}, it is in the history of converted maps), written out: the generated one is linked at its first
     * call through method handles, tens of milliseconds of a short command's start.
     */
    @Override
    public String toString() {
        return "Surface[thicknessUm=" + thicknessUm + ", srvCmPerS=" + srvCmPerS + ", model=" + model + "]";
    }
}
