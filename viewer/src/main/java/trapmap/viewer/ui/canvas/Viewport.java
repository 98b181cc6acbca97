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
        /** Called once per {@link Viewport#set} that changed zoom or centre. */
        void viewportChanged(Viewport v);
    }

    private final List<Listener> listeners = new CopyOnWriteArrayList<>();
    private double zoom = 1;
    private double centreX;
    private double centreY;

    /** Screen pixels per map pixel. */
    public double zoom() {
        return zoom;
    }

    /** Map-pixel x coordinate (0 = left edge of the first pixel) shown at the view centre. */
    public double centreX() {
        return centreX;
    }

    /** Map-pixel y coordinate (0 = top edge of the first row) shown at the view centre. */
    public double centreY() {
        return centreY;
    }

    /**
     * Sets zoom and centre together and tells the listeners once (not at all when nothing changes).
     *
     * @throws IllegalArgumentException when the zoom is not positive or a value is not finite
     */
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

    /** Adds a listener told after every change (on the thread that made it, the Event Dispatch Thread in the UI). */
    public void addListener(Listener l) {
        listeners.add(l);
    }

    /** Removes a listener added with {@link #addListener}. */
    public void removeListener(Listener l) {
        listeners.remove(l);
    }
}
