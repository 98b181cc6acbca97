package trapmap.viewer.ui.canvas;

import java.awt.Graphics;
import java.awt.geom.Line2D;
import java.util.BitSet;
import java.util.function.Consumer;
import javax.swing.JComponent;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.model.WaferMap;

/**
 * Interactive view of one wafer map.
 *
 * <p>Contract (the rest of the viewer codes against exactly these public members):
 * <ul>
 *   <li>{@link #setMap} shows a map (null shows nothing); {@link #setStyle} sets colours and range.</li>
 *   <li>{@link #setFlagged} outlines flagged pixels (bit index {@code y * width + x}; null clears).</li>
 *   <li>{@link #setOutline} draws the wafer edge and the edge-exclusion line (null shape clears).</li>
 *   <li>{@link #setLine} draws a profile line in map millimetres (null clears); {@link #setLineTool} lets the
 *       user drag a new line, reported through {@link #onLineDrawn}.</li>
 *   <li>{@link #onProbe} reports the pixel under the cursor ({@link Probe}; null when outside the map).</li>
 *   <li>{@link #viewport()} is the zoom/pan state; pass one shared {@link Viewport} to link two canvases.</li>
 *   <li>{@link #fit}, {@link #zoomBy}, {@link #zoomToMm} for menus and keys; mouse wheel zooms at the cursor,
 *       drag pans.</li>
 *   <li>{@link #lastFrameMillis()} is the paint time of the last frame, for the status bar and benchmarks.</li>
 * </ul>
 */
public class MapCanvas extends JComponent {
    /** The pixel under the cursor: indices, centre in mm, and its value in the map's unit (NaN for no data). */
    public record Probe(int xPx, int yPx, double xMm, double yMm, double value) {
    }

    private final Viewport viewport;
    private WaferMap map;
    private DisplayStyle style;
    private BitSet flagged;
    private WaferShape outline;
    private double edgeExclusionMm;
    private Line2D lineMm;
    private boolean lineTool;
    private Consumer<Probe> probeListener = p -> { };
    private Consumer<Line2D> lineListener = l -> { };
    private double lastFrameMillis;

    public MapCanvas() {
        this(new Viewport());
    }

    public MapCanvas(Viewport shared) {
        this.viewport = shared;
        viewport.addListener(v -> repaint());
    }

    public Viewport viewport() {
        return viewport;
    }

    public WaferMap map() {
        return map;
    }

    public void setMap(WaferMap map) {
        this.map = map;
        repaint();
    }

    public DisplayStyle style() {
        return style;
    }

    public void setStyle(DisplayStyle style) {
        this.style = style;
        repaint();
    }

    public void setFlagged(BitSet flagged) {
        this.flagged = flagged;
        repaint();
    }

    public void setOutline(WaferShape shape, double edgeExclusionMm) {
        this.outline = shape;
        this.edgeExclusionMm = edgeExclusionMm;
        repaint();
    }

    public void setLine(Line2D mm) {
        this.lineMm = mm;
        repaint();
    }

    public void setLineTool(boolean on) {
        this.lineTool = on;
    }

    public void onProbe(Consumer<Probe> l) {
        this.probeListener = l == null ? p -> { } : l;
    }

    public void onLineDrawn(Consumer<Line2D> l) {
        this.lineListener = l == null ? x -> { } : l;
    }

    /** Whole map visible and centred. */
    public void fit() {
    }

    /** Multiplies the zoom by {@code factor} about the view centre. */
    public void zoomBy(double factor) {
    }

    /** Shows the given rectangle in map millimetres, with a small margin. */
    public void zoomToMm(double minXMm, double minYMm, double maxXMm, double maxYMm) {
    }

    public double lastFrameMillis() {
        return lastFrameMillis;
    }

    @Override
    protected void paintComponent(Graphics g) {
        super.paintComponent(g);
    }
}
