package trapmap.maps.geometry;

import trapmap.maps.raster.PixelGrid;

/**
 * The wafer outline found in the valid data of a map.
 *
 * @param shape         the fitted outline in the wafer coordinates of the grid the map came with
 * @param quality       quality of the chosen model
 * @param alternative   quality of the model that lost (null when it could not be fitted)
 * @param closestFormat the standard format nearest to the fitted outline
 * @param recentredGrid the map's grid with its wafer centre moved to the fitted centre
 */
public record OutlineFit(WaferShape shape, FitQuality quality, FitQuality alternative, FormatMatch closestFormat,
                         PixelGrid recentredGrid) {

    /** The outline models that are fitted and compared. */
    public enum Model {
        /** Circle, with a flat or notch when one is found on the rim. */
        ROUND,
        /** Full or pseudo-square: centre, side, rotation and corner diameter. */
        SQUARE
    }

    public Model model() {
        return quality.model();
    }

    /** The fitted outline centred on the origin of {@link #recentredGrid()}. */
    public WaferShape centredShape() {
        return shape.movedTo(0, 0);
    }

    /** Fitted centre, pixel column. */
    public double centreXPx() {
        return recentredGrid.centreXPx();
    }

    /** Fitted centre, pixel row. */
    public double centreYPx() {
        return recentredGrid.centreYPx();
    }
}
