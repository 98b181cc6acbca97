package trapmap.maps.demo;

/**
 * One defect planted in a demonstration map, as recorded in {@code truth.json}.
 *
 * @param kind            {@code edge-zone}, {@code handling-mark}, {@code ring}, {@code boat-contact},
 *                        {@code cluster} or {@code spot}
 * @param defect          library id of the defect the map's lifetimes were computed with ({@code fe-i}, {@code fe-b},
 *                        {@code midgap})
 * @param centreXMm       centre of the feature, mm from the wafer centre (x right); for an edge zone the middle of
 *                        the wafer side it starts from
 * @param centreYMm       centre of the feature, mm (y up)
 * @param radiusMm        radius of a spot, mark or cluster, of a ring's centre line; NaN for an edge zone
 * @param widthMm         Gaussian width (σ) of a ring, decay length of an edge zone; NaN otherwise
 * @param side            side an edge zone starts from ({@code left}, {@code right}, {@code bottom}, {@code top});
 *                        null otherwise
 * @param probeXMm        pixel centre (mm) where {@code densityPerCm3} holds exactly
 * @param probeYMm        pixel centre (mm) where {@code densityPerCm3} holds exactly
 * @param densityPerCm3   planted density at the probe, cm^-3
 * @param backgroundPerCm3 density the probe would have without this defect, cm^-3
 * @param lifetimeUs      noiseless effective lifetime at the probe, µs
 */
public record PlantedDefect(String kind, String defect, double centreXMm, double centreYMm, double radiusMm,
                            double widthMm, String side, double probeXMm, double probeYMm, double densityPerCm3,
                            double backgroundPerCm3, double lifetimeUs) {

    /** Position tolerance of the truth file, mm. */
    public static final double POSITION_TOLERANCE_MM = 2.0;
    /** Density tolerance of the truth file: a factor either way. */
    public static final double DENSITY_FACTOR = 1.5;
    /** The tolerance text of the truth file. */
    public static final String TOLERANCE = "factor 1.5 on density, 2 mm on position";

    /** True for compact features (spots, marks, clusters) that a threshold finds as one region. */
    public boolean compact() {
        return kind.equals("handling-mark") || kind.equals("boat-contact") || kind.equals("cluster")
                || kind.equals("spot");
    }
}
