package trapmap.physics.spectroscopy;

import trapmap.physics.defect.Defect;

/**
 * A library defect compared with a DPSS curve at its own level.
 *
 * @param defect                the defect
 * @param energyFromIntrinsicEv its E_t − E_i (from its n1, degeneracy included), eV
 * @param point                 the DPSS fit at exactly that level
 * @param onCurve               true when the fit there lies in the minimum-residual band and k agrees within the
 *                              tolerance factor
 */
public record DefectOnCurve(Defect defect, double energyFromIntrinsicEv, DpssPoint point, boolean onCurve) {

    /** Its k = σ_n/σ_p. */
    public double libraryRatio() {
        return defect.captureRatio();
    }
}
