package trapmap.viewer.model;

/**
 * Zoom and centre of a wafer's map view, kept per wafer and in sessions.
 *
 * @param zoom      screen pixels per map pixel
 * @param centreXPx map-pixel x shown at the view centre
 * @param centreYPx map-pixel y shown at the view centre
 */
public record ViewState(double zoom, double centreXPx, double centreYPx) {
    public ViewState {
        if (!(zoom > 0) || !Double.isFinite(zoom) || !Double.isFinite(centreXPx) || !Double.isFinite(centreYPx)) {
            throw new IllegalArgumentException("a view needs a zoom > 0 and a finite centre");
        }
    }
}
