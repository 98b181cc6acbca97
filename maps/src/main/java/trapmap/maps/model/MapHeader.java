package trapmap.maps.model;

import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;

/**
 * Everything of a {@link WaferMap} but its samples: what a map file's metadata holds, known before the samples are
 * read or computed, so that maps can be streamed band by band from one file to another.
 *
 * @param grid       pixel pitch, wafer centre and size in pixels
 * @param quantity   meaning and unit of the samples
 * @param waferId    wafer identifier
 * @param conditions measurement conditions
 * @param provenance source and processing history
 */
public record MapHeader(PixelGrid grid, Quantity quantity, String waferId, MeasurementConditions conditions,
                        Provenance provenance) {

    public MapHeader {
        Checks.notNull(grid, "grid");
        Checks.notNull(quantity, "quantity");
        Checks.notNull(conditions, "conditions");
        Checks.notNull(provenance, "provenance");
        waferId = waferId == null ? "" : waferId;
    }

    /** The header of {@code map}. */
    public static MapHeader of(WaferMap map) {
        return new MapHeader(map.grid(), map.quantity(), map.waferId(), map.conditions(), map.provenance());
    }

    public int width() {
        return grid.width();
    }

    public int height() {
        return grid.height();
    }

    /** As {@link WaferMap#derive}: another quantity, one more processing step recorded. */
    public MapHeader derive(Quantity q, ProcessingStep step) {
        return new MapHeader(grid, q, waferId, conditions, provenance.then(step));
    }

    /** As {@link WaferMap#withConditions}. */
    public MapHeader withConditions(MeasurementConditions c) {
        return new MapHeader(grid, quantity, waferId, c, provenance);
    }
}
