package trapmap.physics.spectroscopy;

import java.util.List;

/**
 * The defect parameter solution surface of one τ_SRH(Δn) curve.
 *
 * @param usableLevels    levels with a finite positive τ_SRH
 * @param points          one point per grid level, from the valence to the conduction band (empty when fewer than
 *                        two levels are usable)
 * @param best            the point with the least χ² (null when there are no points)
 * @param band            the minimum-residual band: grid intervals [from, to] of E_t − E_i (eV) where
 *                        χ² ≤ χ²_min + Δχ²
 * @param bandRatioRange  least and greatest k of the band's points (the spread of k the curve allows; NaN when
 *                        none is finite)
 * @param bestLowerHalf   the least-χ² point with E_t &lt; E_i (null when none)
 * @param bestUpperHalf   the least-χ² point with E_t &gt; E_i (null when none)
 * @param ambiguousHalf   true when both halves of the gap reach the band: the curve does not tell which half the
 *                        level lies in
 * @param defects         the library defects compared with the curve
 * @param reason          one line: the band, the half and the defects on the curve, or why nothing was fitted
 */
public record DpssResult(int usableLevels, List<DpssPoint> points, DpssPoint best, List<double[]> band,
                         double[] bandRatioRange, DpssPoint bestLowerHalf, DpssPoint bestUpperHalf, boolean ambiguousHalf,
                         List<DefectOnCurve> defects, String reason) {
    public DpssResult {
        points = List.copyOf(points);
        band = band.stream().map(double[]::clone).toList();
        bandRatioRange = bandRatioRange.clone();
        defects = List.copyOf(defects);
    }

    @Override
    public double[] bandRatioRange() {
        return bandRatioRange.clone();
    }

    /** The defects that lie on the curve. */
    public List<DefectOnCurve> onCurve() {
        return defects.stream().filter(DefectOnCurve::onCurve).toList();
    }
}
