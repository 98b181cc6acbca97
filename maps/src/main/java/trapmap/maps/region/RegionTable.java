package trapmap.maps.region;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;

/**
 * The regions found with one set of criteria.
 *
 * @param regions       the regions in id order
 * @param criteria      how they were found
 * @param edgeReference what their edge distances are measured to
 */
public record RegionTable(List<Region> regions, RegionCriteria criteria, EdgeReference edgeReference) {

    /** What the edge distance of a region is measured to. */
    public enum EdgeReference {
        /** The outline of a given wafer shape. */
        WAFER_SHAPE,
        /** The outline of the map's valid data (enclosed holes filled). */
        DATA_OUTLINE
    }

    public RegionTable {
        regions = List.copyOf(regions);
    }

    public int size() {
        return regions.size();
    }

    /** Largest area first (ties by id). */
    public List<Region> byArea() {
        return sorted(Comparator.comparingDouble(Region::areaMm2).reversed().thenComparingInt(Region::id));
    }

    /** Most extreme peak first: highest above the threshold, lowest below it (ties by id). */
    public List<Region> byPeak() {
        Comparator<Region> peak = Comparator.comparingDouble(Region::peakValue);
        if (criteria.side() == RegionCriteria.Side.ABOVE) {
            peak = peak.reversed();
        }
        return sorted(peak.thenComparingInt(Region::id));
    }

    /** Area of all regions together, mm². */
    public double totalAreaMm2() {
        return regions.stream().mapToDouble(Region::areaMm2).sum();
    }

    private List<Region> sorted(Comparator<Region> order) {
        List<Region> out = new ArrayList<>(regions);
        out.sort(order);
        return List.copyOf(out);
    }
}
