package trapmap.maps.batch;

import trapmap.maps.model.WaferMap;

/**
 * The recurrence of flagged positions in one wafer family.
 *
 * @param family   the family (outline format, or {@code fitted})
 * @param fraction per cell, the flagged wafers over the wafers evaluated there ({@code Quantity.FRACTION}, 0 to 1;
 *                 NaN where no wafer was evaluated)
 * @param wafersPerCell per cell (the fraction map's pixel order), the number of wafers evaluated there
 * @param wafers   the wafers of the family
 */
public record Recurrence(String family, WaferMap fraction, int[] wafersPerCell, int wafers) {
    public Recurrence {
        if (wafersPerCell.length != fraction.width() * fraction.height()) {
            throw new IllegalArgumentException("wafers per cell must have one entry per cell ("
                    + fraction.width() * fraction.height() + ") but has " + wafersPerCell.length);
        }
        wafersPerCell = wafersPerCell.clone();
    }

    /** The number of wafers evaluated at cell {@code i} (pixel index of the fraction map). */
    public int wafersAt(int i) {
        return wafersPerCell[i];
    }
}
