package trapmap.viewer.ui.canvas;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Cursor;
import java.awt.Dimension;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.Shape;
import java.awt.Stroke;
import java.awt.event.ActionEvent;
import java.awt.event.KeyEvent;
import java.awt.event.MouseAdapter;
import java.awt.event.MouseEvent;
import java.awt.event.MouseWheelEvent;
import java.awt.geom.AffineTransform;
import java.awt.geom.Line2D;
import java.awt.geom.Path2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.BitSet;
import java.util.List;
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
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

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
 * <p>Rendering: when a map is set, a pyramid of halving resolutions (mean of the valid samples of each 2×2 block)
 * is built on a background thread. A frame uses the coarsest level whose pixels are still no larger than a screen
 * pixel, colours only the 256² tiles of it that are visible, and keeps coloured tiles in a memory-bounded cache
 * that a style change empties. Above one screen pixel per map pixel every map pixel is a crisp square (nearest
 * neighbour), with a faint pixel grid from {@value #GRID_ZOOM} screen pixels per map pixel. Pixels without data are
 * drawn in a neutral grey unlike any colour of the map ({@link Colouring#noDataRgb}); outside the map is the
 * component background. Flagged pixels show as a translucent tint whose strength is the flagged fraction of each
 * displayed pixel, and from {@value #OUTLINE_ZOOM} screen pixels per map pixel as outlines along the pixel edges.
 */
public class MapCanvas extends JComponent {
    /** The pixel under the cursor: indices, centre in mm, and its value in the map's unit (NaN for no data). */
    public record Probe(int xPx, int yPx, double xMm, double yMm, double value) {
    }

    /** Side of a cached tile, level pixels. */
    static final int TILE = 256;
    /** Screen pixels per map pixel from which flagged pixels are outlined rather than tinted. */
    static final double OUTLINE_ZOOM = 4;
    /** Screen pixels per map pixel from which the faint pixel grid is drawn. */
    static final double GRID_ZOOM = 16;
    /** Largest zoom, screen pixels per map pixel. */
    static final double MAX_ZOOM = 512;
    /** Most tiles coloured in one frame (about 6 ms on two cores); the rest follow in the next frames. */
    static final int NEW_TILES_PER_FRAME = 24;
    /** Memory for coloured tiles. */
    static final long TILE_CACHE_BYTES = 96L << 20;
    /** Memory for flagged-fraction tint tiles. */
    static final long TINT_CACHE_BYTES = 48L << 20;

    static final Color BACKGROUND = new Color(0xB4B7BC);
    static final Color FLAG_COLOUR = new Color(0xFF2E9A);
    static final Color FLAG_COLOUR_ON_HEAT = new Color(0x00E5FF);
    static final Color OUTLINE_COLOUR = new Color(0xF0F0F0);
    static final Color OUTLINE_SHADOW = new Color(0x202020);
    static final Color LINE_COLOUR = new Color(0xFFFFFF);
    static final Color GRID_COLOUR = new Color(0x8A8A8A);

    private static final ExecutorService PYRAMID_BUILDER = Executors.newSingleThreadExecutor(r -> {
        Thread t = new Thread(r, "trapmap-map-pyramid");
        t.setDaemon(true);
        return t;
    });

    private final Viewport viewport;
    private WaferMap map;
    private DisplayStyle style;
    private BitSet flagged;
    private long[] flaggedWords;
    private Path2D.Double outlineMm;
    private Path2D.Double exclusionMm;
    private OutlineImage outlineImage;
    private Line2D lineMm;
    private boolean lineTool;
    private Consumer<Probe> probeListener = p -> { };
    private Consumer<Line2D> lineListener = l -> { };
    private double lastFrameMillis;

    private Pyramid pyramid;
    private CompletableFuture<Void> pyramidDone = CompletableFuture.completedFuture(null);
    private AtomicBoolean pyramidCancel = new AtomicBoolean();
    private Colouring colouring;
    private final TileCache<BufferedImage> tiles = new TileCache<>(TILE_CACHE_BYTES);
    private final TileCache<BufferedImage> tints = new TileCache<>(TINT_CACHE_BYTES);
    private static final BufferedImage NO_TINT = new BufferedImage(1, 1, BufferedImage.TYPE_INT_ARGB);
    /** A fit or zoom asked for before the component had a size, done at the first frame. */
    private Runnable pendingView;
    private int tilesColoured;
    private int deferredTiles;

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
        tiles.clear();
        tints.clear();
        if (map == null) {
            pyramid = null;
            pyramidDone = CompletableFuture.completedFuture(null);
        } else {
            Pyramid p = new Pyramid(map.raster());
            AtomicBoolean cancel = new AtomicBoolean();
            pyramid = p;
            pyramidCancel = cancel;
            pyramidDone = CompletableFuture.runAsync(() -> p.build(cancel), PYRAMID_BUILDER)
                    .whenComplete((v, e) -> SwingUtilities.invokeLater(this::repaint));
            if (old == null || old.width() != map.width() || old.height() != map.height()) {
                pendingView = this::fit;
            }
        }
        if (flagged != null && map != null && flagged.length() > map.width() * map.height()) {
            setFlagged(null);
        }
        repaint();
    }

    /** The colours and range in use, or null before the first {@link #setStyle}. */
    public DisplayStyle style() {
        return style;
    }

    /** Sets colours, scale and range; coloured tiles are rebuilt. Without a style nothing is drawn. */
    public void setStyle(DisplayStyle style) {
        if (style != null && style.equals(this.style)) {
            return;
        }
        this.style = style;
        colouring = style == null ? null : new Colouring(style);
        tiles.clear();
        repaint();
    }

    /**
     * Marks pixels as flagged (bit {@code y * width + x}; null clears): tinted when zoomed out, outlined along the
     * pixel edges when zoomed in. The set is read, not copied: pass a new set rather than changing this one.
     */
    public void setFlagged(BitSet flagged) {
        this.flagged = flagged;
        this.flaggedWords = flagged == null || flagged.isEmpty() ? null : flagged.toLongArray();
        tints.clear();
        repaint();
    }

    /**
     * Draws the wafer edge of {@code shape} and the edge-exclusion line {@code edgeExclusionMm} inside it (0 or less:
     * no exclusion line); a null shape clears both.
     */
    public void setOutline(WaferShape shape, double edgeExclusionMm) {
        outlineMm = shape == null ? null : OutlinePath.trace(shape, 0);
        exclusionMm = shape == null || !(edgeExclusionMm > 0) ? null : OutlinePath.trace(shape, edgeExclusionMm);
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

    /** Screen x of map-pixel coordinate {@code mx} (0 = left edge of the first pixel). */
    double screenX(double mx) {
        return (mx - viewport.centreX()) * viewport.zoom() + getWidth() / 2.0;
    }

    double screenY(double my) {
        return (my - viewport.centreY()) * viewport.zoom() + getHeight() / 2.0;
    }

    /** Map-pixel coordinate under screen x. */
    double mapX(double sx) {
        return viewport.centreX() + (sx - getWidth() / 2.0) / viewport.zoom();
    }

    double mapY(double sy) {
        return viewport.centreY() + (sy - getHeight() / 2.0) / viewport.zoom();
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
                drawMap(g2);
            }
        } finally {
            g2.dispose();
        }
        lastFrameMillis = (System.nanoTime() - t0) / 1e6;
    }

    private void drawMap(Graphics2D g) {
        double z = viewport.zoom();
        deferredTiles = 0;
        int level = levelFor(z, pyramid.levelCount());
        Pyramid.Level lv = pyramid.level(level);
        if (lv == null) {
            g.setColor(new Color(colouring.noData()));
            g.fillRect(ix(screenX(0)), iy(screenY(0)), ix(screenX(map.width())) - ix(screenX(0)),
                    iy(screenY(map.height())) - iy(screenY(0)));
            drawMessage(g, "Preparing view…");
            return;
        }
        g.setRenderingHint(RenderingHints.KEY_INTERPOLATION, RenderingHints.VALUE_INTERPOLATION_NEAREST_NEIGHBOR);
        g.setRenderingHint(RenderingHints.KEY_RENDERING, RenderingHints.VALUE_RENDER_SPEED);
        int f = lv.scale();
        // visible range in level pixels
        int lx0 = Math.max(0, (int) Math.floor(mapX(0) / f));
        int ly0 = Math.max(0, (int) Math.floor(mapY(0) / f));
        int lx1 = Math.min(lv.width(), (int) Math.ceil(mapX(getWidth()) / f));
        int ly1 = Math.min(lv.height(), (int) Math.ceil(mapY(getHeight()) / f));
        if (lx0 >= lx1 || ly0 >= ly1) {
            drawOverlays(g);
            return;
        }
        int tx0 = lx0 / TILE;
        int tx1 = (lx1 - 1) / TILE;
        int ty0 = ly0 / TILE;
        int ty1 = (ly1 - 1) / TILE;
        BufferedImage[][] imgs = colourTiles(lv, tx0, ty0, tx1, ty1);
        boolean tint = flaggedWords != null && z < OUTLINE_ZOOM;
        BufferedImage[][] tintImgs = tint ? tintTiles(lv, tx0, ty0, tx1, ty1) : null;
        for (int ty = ty0; ty <= ty1; ty++) {
            for (int tx = tx0; tx <= tx1; tx++) {
                BufferedImage img = imgs[ty - ty0][tx - tx0];
                if (img == null) {
                    drawStandIn(g, lv, tx, ty, lx0, ly0, lx1, ly1);
                } else {
                    drawTile(g, img, lv, tx, ty, lx0, ly0, lx1, ly1);
                }
            }
        }
        if (tint) {
            for (int ty = ty0; ty <= ty1; ty++) {
                for (int tx = tx0; tx <= tx1; tx++) {
                    BufferedImage t = tintImgs[ty - ty0][tx - tx0];
                    if (t != NO_TINT) {
                        drawTile(g, t, lv, tx, ty, lx0, ly0, lx1, ly1);
                    }
                }
            }
        }
        if (z >= GRID_ZOOM) {
            drawPixelGrid(g);
        }
        if (flaggedWords != null && z >= OUTLINE_ZOOM) {
            drawFlagOutlines(g);
        }
        drawOverlays(g);
    }

    /** Draws the part of tile ({@code tx}, {@code ty}) inside the visible level-pixel range. */
    private void drawTile(Graphics2D g, BufferedImage img, Pyramid.Level lv, int tx, int ty, int lx0, int ly0,
                          int lx1, int ly1) {
        int f = lv.scale();
        int sx0 = Math.max(lx0, tx * TILE);
        int sy0 = Math.max(ly0, ty * TILE);
        int sx1 = Math.min(lx1, tx * TILE + img.getWidth());
        int sy1 = Math.min(ly1, ty * TILE + img.getHeight());
        int dx0 = ix(screenX((double) sx0 * f));
        int dy0 = iy(screenY((double) sy0 * f));
        int dx1 = ix(screenX((double) sx1 * f));
        int dy1 = iy(screenY((double) sy1 * f));
        g.drawImage(img, dx0, dy0, dx1, dy1, sx0 - tx * TILE, sy0 - ty * TILE, sx1 - tx * TILE, sy1 - ty * TILE,
                null);
    }

    private static int ix(double x) {
        return (int) Math.floor(x + 0.5);
    }

    private static int iy(double y) {
        return (int) Math.floor(y + 0.5);
    }

    /**
     * The coloured tiles of the range. Missing tiles are coloured in parallel, nearest the view centre first, at
     * most {@link #NEW_TILES_PER_FRAME} per frame; the others stay null (drawn from a coarser level) and another
     * frame is asked for.
     */
    private BufferedImage[][] colourTiles(Pyramid.Level lv, int tx0, int ty0, int tx1, int ty1) {
        BufferedImage[][] out = new BufferedImage[ty1 - ty0 + 1][tx1 - tx0 + 1];
        List<int[]> missing = new ArrayList<>();
        for (int ty = ty0; ty <= ty1; ty++) {
            for (int tx = tx0; tx <= tx1; tx++) {
                BufferedImage img = tiles.get(TileCache.key(lv.index(), tx, ty));
                if (img == null) {
                    missing.add(new int[] {tx, ty});
                } else {
                    out[ty - ty0][tx - tx0] = img;
                }
            }
        }
        deferredTiles = Math.max(0, missing.size() - NEW_TILES_PER_FRAME);
        if (deferredTiles > 0) {
            double cx = mapX(getWidth() / 2.0) / lv.scale() / TILE - 0.5;
            double cy = mapY(getHeight() / 2.0) / lv.scale() / TILE - 0.5;
            missing.sort(java.util.Comparator.comparingDouble(t -> Math.hypot(t[0] - cx, t[1] - cy)));
            missing = missing.subList(0, NEW_TILES_PER_FRAME);
            repaint();
        }
        Colouring c = colouring;
        BufferedImage[] made = missing.parallelStream().map(t -> colourTile(c, lv, t[0], t[1]))
                .toArray(BufferedImage[]::new);
        for (int i = 0; i < made.length; i++) {
            int[] t = missing.get(i);
            out[t[1] - ty0][t[0] - tx0] = made[i];
            tiles.put(TileCache.key(lv.index(), t[0], t[1]), made[i], 4L * made[i].getWidth() * made[i].getHeight());
        }
        tilesColoured += made.length;
        return out;
    }

    /**
     * Draws the visible part of tile ({@code tx}, {@code ty}) of {@code lv}, not yet coloured, from the first coarser
     * level whose covering tiles are cached (the coarsest level, one small tile, is coloured when needed).
     */
    private void drawStandIn(Graphics2D g, Pyramid.Level lv, int tx, int ty, int lx0, int ly0, int lx1, int ly1) {
        int f = lv.scale();
        int sx0 = Math.max(lx0, tx * TILE);
        int sy0 = Math.max(ly0, ty * TILE);
        int sx1 = Math.min(lx1, tx * TILE + TILE);
        int sy1 = Math.min(ly1, ty * TILE + TILE);
        int dx0 = ix(screenX((double) sx0 * f));
        int dy0 = iy(screenY((double) sy0 * f));
        Shape clip = g.getClip();
        g.clipRect(dx0, dy0, ix(screenX((double) sx1 * f)) - dx0, iy(screenY((double) sy1 * f)) - dy0);
        int top = pyramid.levelCount() - 1;
        for (int k = lv.index() + 1; k <= top && pyramid.level(k) != null; k++) {
            Pyramid.Level c = pyramid.level(k);
            int d = k - lv.index();
            int cx0 = sx0 >> d;
            int cy0 = sy0 >> d;
            int cx1 = Math.min(c.width(), ((sx1 - 1) >> d) + 1);
            int cy1 = Math.min(c.height(), ((sy1 - 1) >> d) + 1);
            List<BufferedImage> found = new ArrayList<>();
            List<int[]> at = new ArrayList<>();
            for (int cty = cy0 / TILE; cty <= (cy1 - 1) / TILE; cty++) {
                for (int ctx = cx0 / TILE; ctx <= (cx1 - 1) / TILE; ctx++) {
                    long key = TileCache.key(k, ctx, cty);
                    BufferedImage img = tiles.get(key);
                    if (img == null && k == top) {
                        img = colourTile(colouring, c, ctx, cty);
                        tiles.put(key, img, 4L * img.getWidth() * img.getHeight());
                    }
                    if (img != null) {
                        found.add(img);
                        at.add(new int[] {ctx, cty});
                    }
                }
            }
            int needed = ((cy1 - 1) / TILE - cy0 / TILE + 1) * ((cx1 - 1) / TILE - cx0 / TILE + 1);
            if (found.size() == needed) {
                for (int i = 0; i < needed; i++) {
                    drawTile(g, found.get(i), c, at.get(i)[0], at.get(i)[1], cx0, cy0, cx1, cy1);
                }
                break;
            }
        }
        g.setClip(clip);
    }

    static BufferedImage colourTile(Colouring c, Pyramid.Level lv, int tx, int ty) {
        int x0 = tx * TILE;
        int y0 = ty * TILE;
        int w = Math.min(TILE, lv.width() - x0);
        int h = Math.min(TILE, lv.height() - y0);
        int[] px = new int[w * h];
        c.colourise(lv.samples(), lv.width(), x0, y0, w, h, px);
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        img.getRaster().setDataElements(0, 0, w, h, px);
        return img;
    }

    /** The tint tiles of the range ({@link #NO_TINT} where nothing is flagged), computing missing ones in parallel. */
    private BufferedImage[][] tintTiles(Pyramid.Level lv, int tx0, int ty0, int tx1, int ty1) {
        BufferedImage[][] out = new BufferedImage[ty1 - ty0 + 1][tx1 - tx0 + 1];
        List<int[]> missing = new ArrayList<>();
        for (int ty = ty0; ty <= ty1; ty++) {
            for (int tx = tx0; tx <= tx1; tx++) {
                BufferedImage img = tints.get(TileCache.key(lv.index(), tx, ty));
                if (img == null) {
                    missing.add(new int[] {tx, ty});
                } else {
                    out[ty - ty0][tx - tx0] = img;
                }
            }
        }
        long[] words = flaggedWords;
        int mw = map.width();
        int mh = map.height();
        int rgb = flagColour().getRGB() & 0xFFFFFF;
        BufferedImage[] made = missing.parallelStream().map(t -> tintTile(words, mw, mh, lv, t[0], t[1], rgb))
                .toArray(BufferedImage[]::new);
        for (int i = 0; i < made.length; i++) {
            int[] t = missing.get(i);
            out[t[1] - ty0][t[0] - tx0] = made[i];
            long bytes = made[i] == NO_TINT ? 64 : 4L * made[i].getWidth() * made[i].getHeight();
            tints.put(TileCache.key(lv.index(), t[0], t[1]), made[i], bytes);
        }
        return out;
    }

    private static BufferedImage tintTile(long[] words, int mw, int mh, Pyramid.Level lv, int tx, int ty, int rgb) {
        int x0 = tx * TILE;
        int y0 = ty * TILE;
        int w = Math.min(TILE, lv.width() - x0);
        int h = Math.min(TILE, lv.height() - y0);
        float[] frac = new float[w * h];
        if (!Flags.fractions(words, mw, mh, lv.index(), x0, y0, w, h, frac)) {
            return NO_TINT;
        }
        int[] px = new int[w * h];
        for (int i = 0; i < px.length; i++) {
            // any flagged pixel shows; a fully flagged block is strongly tinted
            px[i] = frac[i] == 0 ? 0 : ((int) (90 + 130 * frac[i]) << 24) | rgb;
        }
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_ARGB);
        img.getRaster().setDataElements(0, 0, w, h, px);
        return img;
    }

    private Color flagColour() {
        return style != null && style.colours() == trapmap.maps.io.ColourMap.HEAT ? FLAG_COLOUR_ON_HEAT
                : FLAG_COLOUR;
    }

    /** Visible map-pixel range [x0, x1) × [y0, y1) as {x0, y0, x1, y1}. */
    private int[] visiblePixels() {
        return new int[] {
            Math.max(0, (int) Math.floor(mapX(0))),
            Math.max(0, (int) Math.floor(mapY(0))),
            Math.min(map.width(), (int) Math.ceil(mapX(getWidth()))),
            Math.min(map.height(), (int) Math.ceil(mapY(getHeight()))),
        };
    }

    private void drawPixelGrid(Graphics2D g) {
        int[] v = visiblePixels();
        g.setColor(GRID_COLOUR);
        int top = iy(screenY(v[1]));
        int bottom = iy(screenY(v[3]));
        int left = ix(screenX(v[0]));
        int right = ix(screenX(v[2]));
        for (int x = v[0]; x <= v[2]; x++) {
            g.fillRect(ix(screenX(x)), top, 1, bottom - top);
        }
        for (int y = v[1]; y <= v[3]; y++) {
            g.fillRect(left, iy(screenY(y)), right - left, 1);
        }
    }

    /** Pixel-edge outlines of the flagged regions: an edge wherever a flagged pixel meets an unflagged one. */
    private void drawFlagOutlines(Graphics2D g) {
        int[] v = visiblePixels();
        int w = map.width();
        int h = map.height();
        BitSet b = flagged;
        double z = viewport.zoom();
        int t = z >= 12 ? 2 : 1;
        g.setColor(flagColour());
        for (int y = v[1]; y < v[3]; y++) {
            int sy0 = iy(screenY(y));
            int sy1 = iy(screenY(y + 1));
            for (int x = b.nextSetBit(y * w + v[0]) - y * w; x >= 0 && x < v[2]; x = b.nextSetBit(y * w + x + 1) - y * w) {
                int sx0 = ix(screenX(x));
                int sx1 = ix(screenX(x + 1));
                if (x == 0 || !b.get(y * w + x - 1)) {
                    g.fillRect(sx0, sy0, t, sy1 - sy0);
                }
                if (x == w - 1 || !b.get(y * w + x + 1)) {
                    g.fillRect(sx1 - t, sy0, t, sy1 - sy0);
                }
                if (y == 0 || !b.get((y - 1) * w + x)) {
                    g.fillRect(sx0, sy0, sx1 - sx0, t);
                }
                if (y == h - 1 || !b.get((y + 1) * w + x)) {
                    g.fillRect(sx0, sy1 - t, sx1 - sx0, t);
                }
            }
        }
    }

    private void drawOverlays(Graphics2D g) {
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_STROKE_CONTROL, RenderingHints.VALUE_STROKE_PURE);
        AffineTransform t = mmToScreen();
        if (outlineMm != null) {
            drawOutline(g, t);
        }
        if (lineMm != null) {
            drawProfileLine(g, t, lineMm);
        }
        if (lineStartMm != null && lineEndMm != null) {
            drawProfileLine(g, t, new Line2D.Double(lineStartMm[0], lineStartMm[1], lineEndMm[0], lineEndMm[1]));
        }
        drawScaleBar(g);
    }

    /**
     * Wafer edge and edge-exclusion line. Stroking the 1440-point polygons with antialiasing costs several ms, so
     * while the whole outline is on or near the screen it is drawn once per zoom into an image that panning only
     * moves (by whole pixels); zoomed in, only the visible part is stroked directly.
     */
    private void drawOutline(Graphics2D g, AffineTransform t) {
        java.awt.Rectangle b = t.createTransformedShape(outlineMm).getBounds();
        b.grow(4, 4);
        if ((long) b.width * b.height > (long) getWidth() * getHeight()) {
            strokeOutline(g, t);
            return;
        }
        double ox = t.getTranslateX();
        double oy = t.getTranslateY();
        OutlineImage c = outlineImage;
        if (c == null || c.scale() != t.getScaleX() || c.edge() != outlineMm || c.exclusion() != exclusionMm) {
            BufferedImage img = new BufferedImage(b.width, b.height, BufferedImage.TYPE_INT_ARGB);
            Graphics2D ig = img.createGraphics();
            ig.setRenderingHints(g.getRenderingHints());
            AffineTransform local = new AffineTransform(t);
            local.preConcatenate(AffineTransform.getTranslateInstance(-b.x, -b.y));
            strokeOutline(ig, local);
            ig.dispose();
            c = new OutlineImage(img, t.getScaleX(), outlineMm, exclusionMm, ox, oy, b.x, b.y);
            outlineImage = c;
        }
        g.drawImage(c.image(), c.x() + (int) Math.round(ox - c.ox()), c.y() + (int) Math.round(oy - c.oy()), null);
    }

    private record OutlineImage(BufferedImage image, double scale, Path2D edge, Path2D exclusion, double ox,
                                double oy, int x, int y) {
    }

    private void strokeOutline(Graphics2D g, AffineTransform t) {
        drawHaloed(g, t.createTransformedShape(outlineMm), new BasicStroke(1.5f), OUTLINE_COLOUR);
        if (exclusionMm != null) {
            drawHaloed(g, t.createTransformedShape(exclusionMm), new BasicStroke(1.2f, BasicStroke.CAP_BUTT,
                    BasicStroke.JOIN_ROUND, 10, new float[] {6, 4}, 0), OUTLINE_COLOUR);
        }
    }

    private static void drawHaloed(Graphics2D g, Shape s, Stroke stroke, Color c) {
        BasicStroke b = (BasicStroke) stroke;
        g.setStroke(new BasicStroke(b.getLineWidth() + 2, b.getEndCap(), b.getLineJoin(), b.getMiterLimit(),
                b.getDashArray(), b.getDashPhase()));
        g.setColor(new Color(OUTLINE_SHADOW.getRGB() & 0xFFFFFF | 0x90000000, true));
        g.draw(s);
        g.setStroke(stroke);
        g.setColor(c);
        g.draw(s);
    }

    private static void drawProfileLine(Graphics2D g, AffineTransform t, Line2D mm) {
        Shape s = t.createTransformedShape(mm);
        drawHaloed(g, s, new BasicStroke(2f, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND), LINE_COLOUR);
        double[] p = {mm.getX1(), mm.getY1(), mm.getX2(), mm.getY2()};
        t.transform(p, 0, p, 0, 2);
        g.setColor(LINE_COLOUR);
        g.fillOval((int) Math.round(p[0]) - 4, (int) Math.round(p[1]) - 4, 8, 8);
        g.setColor(OUTLINE_SHADOW);
        g.drawOval((int) Math.round(p[0]) - 4, (int) Math.round(p[1]) - 4, 8, 8);
        g.drawOval((int) Math.round(p[2]) - 4, (int) Math.round(p[3]) - 4, 8, 8);
    }

    /** A bar of a round length in mm, about 100 screen pixels long, in the lower left corner. */
    private void drawScaleBar(Graphics2D g) {
        double pxPerMm = viewport.zoom() / map.grid().pitchMm();
        double mm = niceLength(100 / pxPerMm);
        int len = (int) Math.round(mm * pxPerMm);
        if (len < 10 || len > getWidth() - 30) {
            return;
        }
        String label = formatMm(mm);
        g.setFont(getFont() != null ? getFont().deriveFont(Font.PLAIN, 12f) : new Font(Font.SANS_SERIF, Font.PLAIN, 12));
        FontMetrics fm = g.getFontMetrics();
        int x = 12;
        int y = getHeight() - 14;
        int boxW = Math.max(len, fm.stringWidth(label)) + 12;
        g.setColor(new Color(255, 255, 255, 200));
        g.fillRoundRect(x - 6, y - fm.getAscent() - 12, boxW, fm.getAscent() + 20, 6, 6);
        g.setColor(Color.BLACK);
        g.fillRect(x, y - 4, len, 4);
        g.fillRect(x, y - 8, 1, 8);
        g.fillRect(x + len - 1, y - 8, 1, 8);
        g.drawString(label, x, y - 10);
    }

    /** The largest 1, 2 or 5 × 10^k not above {@code v}. */
    static double niceLength(double v) {
        double p = Math.pow(10, Math.floor(Math.log10(v)));
        double m = v / p;
        return (m >= 5 ? 5 : m >= 2 ? 2 : 1) * p;
    }

    static String formatMm(double mm) {
        if (mm >= 1) {
            return String.format(java.util.Locale.ROOT, "%.0f mm", mm);
        }
        if (mm >= 0.001) {
            return String.format(java.util.Locale.ROOT, "%.0f µm", mm * 1000);
        }
        return String.format(java.util.Locale.ROOT, "%.2g mm", mm);
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
        return tilesColoured;
    }

    /** Visible tiles the last frame drew from a coarser level because they were not coloured yet. */
    int deferredTiles() {
        return deferredTiles;
    }

    int cachedTiles() {
        return tiles.size();
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
