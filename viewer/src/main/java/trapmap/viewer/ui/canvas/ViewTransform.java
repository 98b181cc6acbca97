package trapmap.viewer.ui.canvas;

/**
 * Map pixels ↔ component pixels for one frame: map-pixel coordinate ({@code centreX}, {@code centreY}) (0 = the
 * left/top edge of the first pixel) at the component centre, {@code zoom} component pixels per map pixel.
 */
record ViewTransform(double zoom, double centreX, double centreY, int width, int height) {

    static ViewTransform of(Viewport v, int width, int height) {
        return new ViewTransform(v.zoom(), v.centreX(), v.centreY(), width, height);
    }

    /** Component x of map-pixel coordinate {@code mx}. */
    double screenX(double mx) {
        return (mx - centreX) * zoom + width / 2.0;
    }

    double screenY(double my) {
        return (my - centreY) * zoom + height / 2.0;
    }

    /** Map-pixel coordinate under component x. */
    double mapX(double sx) {
        return centreX + (sx - width / 2.0) / zoom;
    }

    double mapY(double sy) {
        return centreY + (sy - height / 2.0) / zoom;
    }

    /** Component column of the pixel edge at map-pixel coordinate {@code mx}: shared edges round alike. */
    int edgeX(double mx) {
        return (int) Math.floor(screenX(mx) + 0.5);
    }

    int edgeY(double my) {
        return (int) Math.floor(screenY(my) + 0.5);
    }

    /** Visible map-pixel range [x0, x1) × [y0, y1) of a {@code w}×{@code h} map as {x0, y0, x1, y1}. */
    int[] visiblePixels(int w, int h) {
        return new int[] {
            Math.max(0, (int) Math.floor(mapX(0))),
            Math.max(0, (int) Math.floor(mapY(0))),
            Math.min(w, (int) Math.ceil(mapX(width))),
            Math.min(h, (int) Math.ceil(mapY(height))),
        };
    }
}
