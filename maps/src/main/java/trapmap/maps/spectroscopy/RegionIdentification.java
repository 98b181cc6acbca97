package trapmap.maps.spectroscopy;

import trapmap.maps.region.Region;
import trapmap.physics.spectroscopy.DpssResult;
import trapmap.physics.spectroscopy.LifetimeCurve;
import trapmap.physics.spectroscopy.Ranking;

/**
 * The identification of one region of a stack (see {@link DefectIdentification} for the region rule and the curve).
 *
 * @param region     the region: id (1-based, as in the region map), pixel count, area, centroid, bounds (mm)
 * @param pixelsUsed pixels whose τ_SRH is finite and positive at every level (those the curve averages; 0 when
 *                   none is, and the level-wise means are then taken over the pixels usable at each level)
 * @param curve      the region's τ_SRH(Δn) curve (s, cm^-3, relative uncertainty); null when no pixel has data
 * @param ranking    the library ranking of the curve; null with the curve
 * @param dpss       the DPSS of the curve; null when it could not be made (see {@code note})
 * @param note       why something is missing, or empty
 */
public record RegionIdentification(Region region, int pixelsUsed, LifetimeCurve curve, Ranking ranking,
                                   DpssResult dpss, String note) {
    /** The region's id (1-based). */
    public int id() {
        return region.id();
    }
}
