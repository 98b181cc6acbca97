package trapmap.viewer.ui.canvas;

import java.awt.Color;
import java.awt.Cursor;
import java.awt.Dimension;
import java.awt.FontMetrics;
import java.awt.Graphics;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.event.ActionEvent;
import java.awt.event.KeyEvent;
import java.awt.event.MouseAdapter;
import java.awt.event.MouseEvent;
import java.awt.event.MouseWheelEvent;
import java.awt.geom.AffineTransform;
import java.awt.geom.Line2D;
import java.util.BitSet;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.function.Consumer;
import javax.swing.AbstractAction;
import javax.swing.InputMap;
import javax.swing.JComponent;
import javax.swing.KeyStroke;
import javax.swing.SwingUtilities;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.ColourMap;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.BlockMeanPyramid;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.viewer.model.FlagOverlay;
import trapmap.maps.raster.PixelGrid;
import trapmap.viewer.graphics.Categories;
import trapmap.viewer.graphics.DisplayStyle;

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
 *
 * <p>Keys when focused: {@code +}/{@code -} zoom, {@code 0} fits, arrows pan, Escape cancels a line being drawn.
 * With the line tool on, the left button draws and the middle or right button pans.
 *
 * <p>Rendering: when a map is set, a pyramid of halving resolutions (mean of the valid samples of each 2×2 block;
 * for a map of category codes the most common code of the block, {@link #pyramidRule}) is built on a background
 * thread. A frame uses the coarsest level whose pixels are still no larger than a screen
 * pixel, colours only the 256² tiles of it that are visible, and keeps coloured tiles in a memory-bounded cache
 * that a style change empties. Above one screen pixel per map pixel every map pixel is a crisp square (nearest
 * neighbour), with a faint pixel grid from {@value #GRID_ZOOM} screen pixels per map pixel. Pixels without data are
 * drawn in a neutral grey unlike any colour of the map ({@link Colouring#noDataRgb}); outside the map is the
 * component background. Flagged pixels show as a translucent tint whose strength is the flagged fraction of each
 * displayed pixel, and from {@value #OUTLINE_ZOOM} screen pixels per map pixel as outlines along the pixel edges.
 *
 * <p>Use a canvas on the Event Dispatch Thread; only the static {@link #flag} may run anywhere (it is meant for a
 * background worker when thresholds change fast).
 */
public class MapCanvas extends JComponent {
    /**
     * The pixel under the cursor.
     *
     * @param xPx   column, 0-based
     * @param yPx   row, 0-based from the top
     * @param xMm   x of the pixel centre on the wafer, mm (see {@link PixelGrid})
     * @param yMm   y of the pixel centre on the wafer, mm, upwards
     * @param value the sample in the map's unit ({@code map().quantity().unit()}); NaN for no data
     */
    public record Probe(int xPx, int yPx, double xMm, double yMm, double value) {
    }

    /** Screen pixels per map pixel from which flagged pixels are outlined rather than tinted. */
    static final double OUTLINE_ZOOM = 4;
    /** Screen pixels per map pixel from which the pixel grid is drawn. */
    static final double GRID_ZOOM = 16;
    /** Largest zoom, screen pixels per map pixel. */
    static final double MAX_ZOOM = 512;
    /** Canvas background outside the map. */
    static final Color BACKGROUND = new Color(0xB4B7BC);
    /** The pyramid's levels stop once the longer side is at most this many pixels. */
    static final int PYRAMID_TOP_SIDE = 64;

    private static final ExecutorService PYRAMID_BUILDER = Executors.newSingleThreadExecutor(r -> {
        Thread t = new Thread(r, "trapmap-map-pyramid");
        t.setDaemon(true);
        return t;
    });

    private final Viewport viewport;
    private final TileLayer layer = new TileLayer();
    private final Overlays overlays = new Overlays();
    private WaferMap map;
    private DisplayStyle style;
    private Categories categories;
    private Colouring colouring;
    private BitSet flagged;
    private FlagOverlay flagOverlay = FlagOverlay.DEFAULT;
    private Line2D lineMm;
    private boolean lineTool;
    private Consumer<Probe> probeListener = p -> { };
    private Consumer<Line2D> lineListener = l -> { };
    private double lastFrameMillis;

    private BlockMeanPyramid pyramid;
    private CompletableFuture<Void> pyramidDone = CompletableFuture.completedFuture(null);
    private AtomicBoolean pyramidCancel = new AtomicBoolean();
    /** A fit or zoom asked for before the component had a size, done at the first frame. */
    private Runnable pendingView;

    private double[] dragStart;
    private double[] lineStartMm;
    private double[] lineEndMm;

    /** A canvas with its own viewport. */
    public MapCanvas() {
        this(new Viewport());
    }

    /** A canvas on a viewport that other canvases may share (they then zoom and pan together). */
    public MapCanvas(Viewport shared) {
        this.viewport = shared;
        viewport.addListener(v -> repaint());
        setOpaque(true);
        setBackground(BACKGROUND);
        setFocusable(true);
        setPreferredSize(new Dimension(640, 640));
        Mouse mouse = new Mouse();
        addMouseListener(mouse);
        addMouseMotionListener(mouse);
        addMouseWheelListener(mouse);
        installKeys();
    }

    /** The zoom/pan state this canvas shows. */
    public Viewport viewport() {
        return viewport;
    }

    /** The map shown, or null. */
    public WaferMap map() {
        return map;
    }

    /**
     * Shows {@code map} (null shows nothing). The resolution pyramid is built on a background thread; until it is
     * ready, zoomed-out frames show a placeholder. A map of another size than the previous one is fitted to the view.
     */
    public void setMap(WaferMap map) {
        WaferMap old = this.map;
        this.map = map;
        pyramidCancel.set(true);
        if (map == null) {
            pyramid = null;
            pyramidDone = CompletableFuture.completedFuture(null);
        } else {
            BlockMeanPyramid p = new BlockMeanPyramid(map.raster(), pyramidRule(map),
                    BlockMeanPyramid.levelsUntil(map.width(), map.height(), PYRAMID_TOP_SIDE));
            AtomicBoolean cancel = new AtomicBoolean();
            pyramid = p;
            layer.setPyramid(p, map.width(), map.height());
            pyramidCancel = cancel;
            pyramidDone = CompletableFuture.runAsync(() -> p.build(cancel), PYRAMID_BUILDER)
                    .whenComplete((v, e) -> SwingUtilities.invokeLater(this::repaint));
            if (old == null || old.width() != map.width() || old.height() != map.height()) {
                pendingView = this::fit;
            }
        }
        if (flagged != null && map != null && flagged.length() > map.width() * map.height()) {
            setFlagged(null);
        } else if (flagged != null) {
            setFlagged(flagged); // the outline follows the new map's size
        }
        repaint();
    }

    /**
     * How the pyramid of {@code map} reduces a block: the most common value for a map of category codes (as its
     * quantity says, {@link trapmap.maps.model.Quantity#categorical}), so that a zoomed-out block shows one of the
     * categories under it; the mean of the valid samples otherwise.
     */
    static BlockMeanPyramid.Rule pyramidRule(WaferMap map) {
        return map.quantity().categorical() ? BlockMeanPyramid.Rule.MOST_COMMON : BlockMeanPyramid.Rule.EXACT_MEAN;
    }

    /** The resolution pyramid of the map shown (null without a map), for tests. */
    BlockMeanPyramid pyramid() {
        return pyramid;
    }

    /** The colours and range in use, or null before the first {@link #setStyle}. */
    public DisplayStyle style() {
        return style;
    }

    /** The categories the map is coloured by, or null for a continuous scale. */
    public Categories categories() {
        return categories;
    }

    /** Sets colours, scale and range; coloured tiles are rebuilt. Without a style nothing is drawn. */
    public void setStyle(DisplayStyle style) {
        setStyle(style, null);
    }

    /**
     * Colours a map of categories by {@code categories} (null: by {@code style}'s continuous scale, as
     * {@link #setStyle(DisplayStyle)}); {@code style} is still required (nothing is drawn without one).
     */
    public void setStyle(DisplayStyle style, Categories categories) {
        if (style != null && style.equals(this.style) && java.util.Objects.equals(categories, this.categories)) {
            return;
        }
        this.style = style;
        this.categories = categories;
        colouring = style == null ? null : new Colouring(style, categories);
        layer.setColouring(colouring);
        int rgb = flagColour().getRGB() & 0xFFFFFF;
        if (rgb != layer.flagRgb()) {
            setFlagged(flagged);
        }
        repaint();
    }

    /**
     * Marks pixels as flagged (bit {@code y * width + x}; null clears): tinted when zoomed out, outlined along the
     * pixel edges when zoomed in. The set is read, not copied: pass a new set rather than changing this one.
     */
    public void setFlagged(BitSet flagged) {
        this.flagged = flagged == null || flagged.isEmpty() ? null : flagged;
        long[] words = null;
        if (this.flagged != null && flagOverlay.mode() != FlagOverlay.Mode.OFF) {
            // outline: the edge pixels of the flagged set (maps module), tinted like a fill
            words = flagOverlay.mode() == FlagOverlay.Mode.OUTLINE && map != null
                    ? Mask.edgePixels(this.flagged, map.width(), map.height()).toLongArray()
                    : this.flagged.toLongArray();
        }
        layer.setFlags(words, flagColour().getRGB() & 0xFFFFFF, flagOverlay);
        repaint();
    }

    /** How flagged pixels are drawn: outline (default), fill or off, and the opacity. */
    public FlagOverlay flagOverlay() {
        return flagOverlay;
    }

    /** Draws flagged pixels as {@code o} says from the next frame on. */
    public void setFlagOverlay(FlagOverlay o) {
        if (o == null || o.equals(flagOverlay)) {
            return;
        }
        flagOverlay = o;
        setFlagged(flagged);
    }

    /**
     * Draws the wafer edge of {@code shape} and the edge-exclusion line {@code edgeExclusionMm} inside it (0 or less:
     * no exclusion line); a null shape clears both.
     */
    public void setOutline(WaferShape shape, double edgeExclusionMm) {
        overlays.setOutline(shape == null ? null : OutlinePath.trace(shape, 0),
                shape == null || !(edgeExclusionMm > 0) ? null : OutlinePath.trace(shape, edgeExclusionMm));
        repaint();
    }

    /** Draws a profile line between two points in wafer millimetres (null clears). */
    public void setLine(Line2D mm) {
        this.lineMm = mm;
        repaint();
    }

    /** With the tool on, dragging with the left button draws a line reported through {@link #onLineDrawn}. */
    public void setLineTool(boolean on) {
        this.lineTool = on;
        cancelLine();
        setCursor(on ? Cursor.getPredefinedCursor(Cursor.CROSSHAIR_CURSOR) : Cursor.getDefaultCursor());
    }

    /** Told the pixel under the cursor as it moves (null when the cursor leaves the map). Null removes. */
    public void onProbe(Consumer<Probe> l) {
        this.probeListener = l == null ? p -> { } : l;
    }

    /** Told each line the user finishes drawing with the line tool, in wafer millimetres. Null removes. */
    public void onLineDrawn(Consumer<Line2D> l) {
        this.lineListener = l == null ? x -> { } : l;
    }

    /** Whole map visible and centred (at the first frame if the canvas has no size yet). */
    public void fit() {
        if (map == null) {
            return;
        }
        if (getWidth() <= 0 || getHeight() <= 0) {
            pendingView = this::fit;
            return;
        }
        pendingView = null;
        viewport.set(fitZoom(), map.width() / 2.0, map.height() / 2.0);
    }

    /** Multiplies the zoom by {@code factor} about the view centre. */
    public void zoomBy(double factor) {
        zoomAbout(factor, getWidth() / 2.0, getHeight() / 2.0);
    }

    /** Shows the given rectangle in map millimetres, with a small margin (at the first frame if not yet shown). */
    public void zoomToMm(double minXMm, double minYMm, double maxXMm, double maxYMm) {
        if (map == null) {
            return;
        }
        if (getWidth() <= 0 || getHeight() <= 0) {
            pendingView = () -> zoomToMm(minXMm, minYMm, maxXMm, maxYMm);
            return;
        }
        pendingView = null;
        PixelGrid g = map.grid();
        double x0 = g.xPx(Math.min(minXMm, maxXMm)) + 0.5;
        double x1 = g.xPx(Math.max(minXMm, maxXMm)) + 0.5;
        double y0 = g.yPx(Math.max(minYMm, maxYMm)) + 0.5;
        double y1 = g.yPx(Math.min(minYMm, maxYMm)) + 0.5;
        double w = Math.max(x1 - x0, 1);
        double h = Math.max(y1 - y0, 1);
        double zoom = 0.9 * Math.min(getWidth() / w, getHeight() / h);
        setView(zoom, (x0 + x1) / 2, (y0 + y1) / 2);
    }

    /** Paint time of the last frame, ms. */
    public double lastFrameMillis() {
        return lastFrameMillis;
    }

    /**
     * The pixels of {@code r} whose value is strictly above ({@code above}) or below {@code threshold}, inside
     * {@code mask} (null: everywhere); pixels without data are never flagged. Bit index {@code y * width + x}, as
     * {@link #setFlagged} takes. Runs on all cores; about 10 ms for 16 megapixels on two cores.
     *
     * @throws IllegalArgumentException when the mask does not have the raster's size
     */
    public static BitSet flag(FloatRaster r, Mask mask, double threshold, boolean above) {
        return Flags.flag(r, mask, threshold, above);
    }

    // ---- view maths -------------------------------------------------------------------------------------------

    /** The current view as a transform between map pixels and component pixels. */
    ViewTransform view() {
        return ViewTransform.of(viewport, getWidth(), getHeight());
    }

    /** Screen x of map-pixel coordinate {@code mx} (0 = left edge of the first pixel). */
    double screenX(double mx) {
        return view().screenX(mx);
    }

    double screenY(double my) {
        return view().screenY(my);
    }

    /** Map-pixel coordinate under screen x. */
    double mapX(double sx) {
        return view().mapX(sx);
    }

    double mapY(double sy) {
        return view().mapY(sy);
    }

    double fitZoom() {
        return 0.96 * Math.min(getWidth() / (double) map.width(), getHeight() / (double) map.height());
    }

    /** Multiplies the zoom by {@code factor} keeping the map point under screen ({@code sx}, {@code sy}) fixed. */
    void zoomAbout(double factor, double sx, double sy) {
        if (map == null || !(factor > 0)) {
            return;
        }
        double mx = mapX(sx);
        double my = mapY(sy);
        double z = clampZoom(viewport.zoom() * factor);
        setView(z, mx - (sx - getWidth() / 2.0) / z, my - (sy - getHeight() / 2.0) / z);
    }

    /** Moves the view by a screen distance (positive dx shows more of the map to the right). */
    void panBy(double dx, double dy) {
        double z = viewport.zoom();
        setView(z, viewport.centreX() + dx / z, viewport.centreY() + dy / z);
    }

    private void setView(double zoom, double cx, double cy) {
        double z = clampZoom(zoom);
        if (map != null) {
            // keep at least part of the map in the view
            cx = Math.max(-getWidth() / 2.0 / z, Math.min(map.width() + getWidth() / 2.0 / z, cx));
            cy = Math.max(-getHeight() / 2.0 / z, Math.min(map.height() + getHeight() / 2.0 / z, cy));
        }
        viewport.set(z, cx, cy);
    }

    private double clampZoom(double z) {
        double min = map == null || getWidth() <= 0 ? 1e-6 : fitZoom() / 8;
        return Math.max(min, Math.min(MAX_ZOOM, z));
    }

    /** The pyramid level drawn at zoom {@code z}: the coarsest whose pixels are not larger than a screen pixel. */
    static int levelFor(double z, int levelCount) {
        if (z >= 1) {
            return 0;
        }
        int k = (int) Math.floor(Math.log(1 / z) / Math.log(2) + 1e-9);
        return Math.max(0, Math.min(levelCount - 1, k));
    }

    /** The probe for screen point ({@code sx}, {@code sy}); null off the map. */
    Probe probeAt(double sx, double sy) {
        if (map == null) {
            return null;
        }
        int x = (int) Math.floor(mapX(sx));
        int y = (int) Math.floor(mapY(sy));
        if (!map.raster().contains(x, y)) {
            return null;
        }
        PixelGrid g = map.grid();
        return new Probe(x, y, g.xMm(x), g.yMm(y), map.raster().get(x, y));
    }

    /** The flag colour for the current colour map. */
    private Color flagColour() {
        return style != null && style.colours() == ColourMap.HEAT ? Overlays.FLAG_COLOUR_ON_HEAT
                : Overlays.FLAG_COLOUR;
    }

    /** Transform from wafer millimetres to screen pixels for the current view. */
    AffineTransform mmToScreen() {
        PixelGrid g = map.grid();
        double z = viewport.zoom();
        double p = g.pitchMm();
        // map-pixel coordinate = grid pixel + 0.5; grid pixel = centre + x / pitch (x), centre - y / pitch (y)
        double ox = screenX(g.centreXPx() + 0.5);
        double oy = screenY(g.centreYPx() + 0.5);
        return new AffineTransform(z / p, 0, 0, -z / p, ox, oy);
    }

    // ---- painting ---------------------------------------------------------------------------------------------

    @Override
    protected void paintComponent(Graphics g) {
        long t0 = System.nanoTime();
        if (pendingView != null && map != null && getWidth() > 0 && getHeight() > 0) {
            Runnable r = pendingView;
            pendingView = null;
            r.run();
        }
        Graphics2D g2 = (Graphics2D) g.create();
        try {
            g2.setColor(getBackground());
            g2.fillRect(0, 0, getWidth(), getHeight());
            if (map == null || colouring == null) {
                drawMessage(g2, map == null ? "No map" : "No colour scale");
            } else {
                drawMap(g2, view());
            }
        } finally {
            g2.dispose();
        }
        lastFrameMillis = (System.nanoTime() - t0) / 1e6;
    }

    private void drawMap(Graphics2D g, ViewTransform v) {
        double z = v.zoom();
        // on a scaled (high-density) screen one component pixel spans several device pixels
        double device = Math.max(1, Math.abs(g.getTransform().getScaleX()));
        BlockMeanPyramid.Level lv = pyramid.level(levelFor(z * device, pyramid.levelCount()));
        if (lv == null) {
            g.setColor(new Color(colouring.noData()));
            g.fillRect(v.edgeX(0), v.edgeY(0), v.edgeX(map.width()) - v.edgeX(0),
                    v.edgeY(map.height()) - v.edgeY(0));
            drawMessage(g, "Preparing view…");
            return;
        }
        g.setRenderingHint(RenderingHints.KEY_INTERPOLATION, RenderingHints.VALUE_INTERPOLATION_NEAREST_NEIGHBOR);
        g.setRenderingHint(RenderingHints.KEY_RENDERING, RenderingHints.VALUE_RENDER_SPEED);
        FlagOverlay.Mode mode = flagOverlay.mode();
        boolean tint = flagged != null && (mode == FlagOverlay.Mode.FILL
                || mode == FlagOverlay.Mode.OUTLINE && z < OUTLINE_ZOOM);
        if (layer.draw(g, v, lv, tint) > 0) {
            repaint(); // the tiles left for later frames
        }
        if (z >= GRID_ZOOM) {
            Overlays.drawPixelGrid(g, v, map.width(), map.height());
        }
        if (flagged != null && mode != FlagOverlay.Mode.OFF && z >= OUTLINE_ZOOM) {
            Overlays.drawFlagOutlines(g, v, flagged, map.width(), map.height(),
                    new Color(layer.flagRgb() | flagOverlay.alpha(1) << 24, true));
        }
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_STROKE_CONTROL, RenderingHints.VALUE_STROKE_PURE);
        AffineTransform t = mmToScreen();
        overlays.drawOutline(g, t, getWidth(), getHeight());
        if (lineMm != null) {
            Overlays.drawProfileLine(g, t, lineMm);
        }
        if (lineStartMm != null && lineEndMm != null) {
            Overlays.drawProfileLine(g, t, new Line2D.Double(lineStartMm[0], lineStartMm[1], lineEndMm[0],
                    lineEndMm[1]));
        }
        Overlays.drawScaleBar(g, z / map.grid().pitchMm(), getWidth(), getHeight(), getFont());
    }

    private void drawMessage(Graphics2D g, String text) {
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setColor(new Color(0x303030));
        FontMetrics fm = g.getFontMetrics();
        g.drawString(text, (getWidth() - fm.stringWidth(text)) / 2, getHeight() / 2);
    }

    // ---- testing and benchmarking hooks ------------------------------------------------------------------------

    /** Waits until the resolution pyramid of the current map is built. */
    void awaitPyramid() {
        pyramidDone.join();
    }

    /** Number of tiles coloured since the canvas was made (cache misses). */
    int tilesColoured() {
        return layer.tilesColoured();
    }

    /** Visible tiles the last frame drew from a coarser level because they were not coloured yet. */
    int deferredTiles() {
        return layer.deferredTiles();
    }

    // ---- input ------------------------------------------------------------------------------------------------

    private void cancelLine() {
        if (lineStartMm != null) {
            lineStartMm = null;
            lineEndMm = null;
            repaint();
        }
    }

    private double[] screenToMm(double sx, double sy) {
        PixelGrid g = map.grid();
        return new double[] {g.xMm(mapX(sx) - 0.5), g.yMm(mapY(sy) - 0.5)};
    }

    private void installKeys() {
        InputMap im = getInputMap(WHEN_FOCUSED);
        bind(im, "zoomIn", () -> zoomBy(Math.sqrt(2)), KeyEvent.VK_PLUS, KeyEvent.VK_EQUALS, KeyEvent.VK_ADD);
        im.put(KeyStroke.getKeyStroke(KeyEvent.VK_EQUALS, KeyEvent.SHIFT_DOWN_MASK), "zoomIn");
        bind(im, "zoomOut", () -> zoomBy(1 / Math.sqrt(2)), KeyEvent.VK_MINUS, KeyEvent.VK_SUBTRACT);
        bind(im, "fit", this::fit, KeyEvent.VK_0, KeyEvent.VK_NUMPAD0);
        bind(im, "panLeft", () -> panBy(-getWidth() / 8.0, 0), KeyEvent.VK_LEFT);
        bind(im, "panRight", () -> panBy(getWidth() / 8.0, 0), KeyEvent.VK_RIGHT);
        bind(im, "panUp", () -> panBy(0, -getHeight() / 8.0), KeyEvent.VK_UP);
        bind(im, "panDown", () -> panBy(0, getHeight() / 8.0), KeyEvent.VK_DOWN);
        bind(im, "cancelLine", this::cancelLine, KeyEvent.VK_ESCAPE);
    }

    private void bind(InputMap im, String name, Runnable action, int... keys) {
        for (int k : keys) {
            im.put(KeyStroke.getKeyStroke(k, 0), name);
        }
        getActionMap().put(name, new AbstractAction(name) {
            @Override
            public void actionPerformed(ActionEvent e) {
                action.run();
            }
        });
    }

    private final class Mouse extends MouseAdapter {
        @Override
        public void mousePressed(MouseEvent e) {
            requestFocusInWindow();
            if (map == null) {
                return;
            }
            if (lineTool && SwingUtilities.isLeftMouseButton(e)) {
                lineStartMm = screenToMm(e.getX(), e.getY());
                lineEndMm = lineStartMm;
            } else {
                dragStart = new double[] {e.getX(), e.getY()};
            }
        }

        @Override
        public void mouseDragged(MouseEvent e) {
            if (map == null) {
                return;
            }
            if (lineStartMm != null) {
                lineEndMm = screenToMm(e.getX(), e.getY());
                repaint();
            } else if (dragStart != null) {
                panBy(dragStart[0] - e.getX(), dragStart[1] - e.getY());
                dragStart = new double[] {e.getX(), e.getY()};
            }
            probeListener.accept(probeAt(e.getX(), e.getY()));
        }

        @Override
        public void mouseReleased(MouseEvent e) {
            dragStart = null;
            if (lineStartMm != null && map != null) {
                double[] a = lineStartMm;
                double[] b = screenToMm(e.getX(), e.getY());
                lineStartMm = null;
                lineEndMm = null;
                if (a[0] != b[0] || a[1] != b[1]) {
                    Line2D l = new Line2D.Double(a[0], a[1], b[0], b[1]);
                    setLine(l);
                    lineListener.accept(l);
                }
                repaint();
            }
        }

        @Override
        public void mouseMoved(MouseEvent e) {
            probeListener.accept(probeAt(e.getX(), e.getY()));
        }

        @Override
        public void mouseExited(MouseEvent e) {
            probeListener.accept(null);
        }

        @Override
        public void mouseWheelMoved(MouseWheelEvent e) {
            zoomAbout(Math.pow(1.2, -e.getPreciseWheelRotation()), e.getX(), e.getY());
        }
    }
}
