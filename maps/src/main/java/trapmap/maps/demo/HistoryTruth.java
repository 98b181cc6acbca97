package trapmap.maps.demo;

import java.time.Instant;
import java.util.List;

/**
 * What {@link HistoryScenario} planted, as read back from a history's {@code truth.json}.
 *
 * @param start            midnight UTC of the first production day
 * @param days             production days
 * @param defect           library id the lifetimes were drawn with
 * @param baselineFeCm3    baseline interstitial iron at the wafer centre, cm^-3
 * @param driftTube        the furnace tube whose iron drifts upward
 * @param steadyTube       the furnace tube whose iron stays
 * @param changeAt         when the drift begins
 * @param driftPerDay      rise of the drifting tube's iron per day after {@code changeAt}, fraction of its level
 * @param badSlot          the boat slot whose wafers carry the contamination spot
 * @param spotXMm          centre of the spot, mm (x right)
 * @param spotYMm          centre of the spot, mm (y up)
 * @param spotRadiusMm     radius of the spot, mm
 * @param spotDensityCm3   interstitial iron inside the spot, cm^-3
 * @param wafers           every wafer, in time order
 */
public record HistoryTruth(Instant start, int days, String defect, double baselineFeCm3, String driftTube,
                           String steadyTube, Instant changeAt, double driftPerDay, int badSlot, double spotXMm,
                           double spotYMm, double spotRadiusMm, double spotDensityCm3, List<Wafer> wafers) {
    public HistoryTruth {
        wafers = List.copyOf(wafers);
    }

    /**
     * One wafer as recorded in the truth file.
     *
     * @param file         map file name
     * @param waferId      wafer id
     * @param lot          lot id
     * @param furnaceTube  furnace tube of its lot
     * @param boatSlot     boat slot
     * @param processedAt  end of its lot's furnace run
     * @param measuredAt   when its map was taken
     * @param driftFactor  factor of the tube drift on its iron
     * @param centreFeCm3  planted interstitial iron at the wafer centre, cm^-3
     * @param defects      the defects planted in it (the spot in the bad slot's wafers, else none)
     */
    public record Wafer(String file, String waferId, String lot, String furnaceTube, int boatSlot,
                        Instant processedAt, Instant measuredAt, double driftFactor, double centreFeCm3,
                        List<PlantedDefect> defects) {
        public Wafer {
            defects = List.copyOf(defects);
        }
    }
}
