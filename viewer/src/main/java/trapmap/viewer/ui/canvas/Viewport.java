package trapmap.viewer.ui.canvas;

import java.util.concurrent.CopyOnWriteArrayList;
import java.util.List;

/**
 * Zoom and pan of a map view: the map pixel shown at the component's centre and the zoom factor (screen pixels per
 * map pixel). Two canvases that share one viewport zoom and pan together.
 */
public final class Viewport {
    /** Told after every change. */
    public interface Listener {
        void viewportChanged(Viewport v);
    }

    private final List<Listener> listeners = new CopyOnWriteArrayList<>();
    private double zoom = 1;
    private double centreX;
    private double centreY;

    public double zoom() {
        return zoom;
    }

    /** Map-pixel x coordinate (0 = left edge of the first pixel) shown at the view centre. */
    public double centreX() {
        return centreX;
    }

    public double centreY() {
        return centreY;
    }

    /** Sets zoom and centre together and tells the listeners once. */
    public void set(double zoom, double centreX, double centreY) {
        if (!(zoom > 0) || !Double.isFinite(zoom) || !Double.isFinite(centreX) || !Double.isFinite(centreY)) {
            throw new IllegalArgumentException("zoom must be > 0 and the centre finite");
        }
        if (zoom == this.zoom && centreX == this.centreX && centreY == this.centreY) {
            return;
        }
        this.zoom = zoom;
        this.centreX = centreX;
        this.centreY = centreY;
        for (Listener l : listeners) {
            l.viewportChanged(this);
        }
    }

    public void addListener(Listener l) {
        listeners.add(l);
    }

    public void removeListener(Listener l) {
        listeners.remove(l);
    }
}
