package trapmap.maps.model;

import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;

/**
 * A map of one quantity over one wafer: the samples, their placement on the wafer, what they mean, the conditions
 * of the measurement and the history of the data. Immutable apart from the shared raster samples (see
 * {@link FloatRaster}).
 *
 * @param raster      samples (NaN = no data)
 * @param grid        pixel pitch and wafer centre
 * @param quantity    meaning and unit of the samples
 * @param waferId     wafer identifier (file name stem when none is known)
 * @param conditions  measurement conditions
 * @param provenance  source and processing history
 */
public record WaferMap(FloatRaster raster, PixelGrid grid, Quantity quantity, String waferId,
                       MeasurementConditions conditions, Provenance provenance) {

    public WaferMap {
        Checks.notNull(raster, "raster");
        Checks.notNull(grid, "grid");
        Checks.notNull(quantity, "quantity");
        Checks.notNull(conditions, "conditions");
        Checks.notNull(provenance, "provenance");
        if (grid.width() != raster.width() || grid.height() != raster.height()) {
            throw new IllegalArgumentException("grid " + grid.width() + "x" + grid.height() + " does not match raster "
                    + raster.width() + "x" + raster.height());
        }
        waferId = waferId == null ? "" : waferId;
    }

    public int width() {
        return raster.width();
    }

    public int height() {
        return raster.height();
    }

    /** The same map with other samples and quantity, one more processing step recorded. */
    public WaferMap derive(FloatRaster samples, Quantity q, ProcessingStep step) {
        return new WaferMap(samples, grid, q, waferId, conditions, provenance.then(step));
    }

    public WaferMap withConditions(MeasurementConditions c) {
        return new WaferMap(raster, grid, quantity, waferId, c, provenance);
    }

    public WaferMap withGrid(PixelGrid g) {
        return new WaferMap(raster, g, quantity, waferId, conditions, provenance);
    }
}
