package trapmap.viewer.ui.canvas;

import java.awt.Graphics2D;
import java.awt.Shape;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import trapmap.maps.raster.BlockMeanPyramid;
import trapmap.viewer.model.FlagOverlay;

/**
 * The map picture of a canvas: coloured 256² tiles of one pyramid level and, over them, the translucent tint of
 * flagged pixels, both cached per (level, tile) with bounded memory. Used on the Event Dispatch Thread; tiles missing
 * from the caches are computed in parallel.
 */
final class TileLayer {
    /** Side of a tile, level pixels. */
    static final int TILE = 256;
    /** Most tiles coloured in one frame (about 10 ms of one core); the rest follow in the next frames. */
    static final int NEW_TILES_PER_FRAME = 16;
    /** Memory for coloured tiles. */
    static final long TILE_CACHE_BYTES = 96L << 20;
    /** Memory for flagged-fraction tint tiles. */
    static final long TINT_CACHE_BYTES = 48L << 20;
    /** Marks a cached tint tile without any flagged pixel. */
    private static final BufferedImage NO_TINT = new BufferedImage(1, 1, BufferedImage.TYPE_INT_ARGB);

    private final TileCache<BufferedImage> tiles = new TileCache<>(TILE_CACHE_BYTES);
    private final TileCache<BufferedImage> tints = new TileCache<>(TINT_CACHE_BYTES);
    private BlockMeanPyramid pyramid;
    private Colouring colouring;
    private long[] flagWords;
    private int flagRgb;
    private FlagOverlay overlay = FlagOverlay.DEFAULT;
    private int mapWidth;
    private int mapHeight;
    private int tilesColoured;
    private int deferredTiles;

    /** A new map's samples: both caches are emptied. */
    void setPyramid(BlockMeanPyramid p, int mapWidth, int mapHeight) {
        pyramid = p;
        this.mapWidth = mapWidth;
        this.mapHeight = mapHeight;
        tiles.clear();
        tints.clear();
    }

    /** A new style: the coloured tiles are emptied. */
    void setColouring(Colouring c) {
        colouring = c;
        tiles.clear();
    }

    /**
     * Pixels to tint as the words of a bit set (null: none; the flagged pixels, or their edge pixels for an outline),
     * the tint colour and the overlay whose alpha they take; the tint tiles are emptied.
     */
    void setFlags(long[] words, int rgb, FlagOverlay overlay) {
        flagWords = words;
        flagRgb = rgb;
        this.overlay = overlay;
        tints.clear();
    }

    int flagRgb() {
        return flagRgb;
    }

    /** Number of tiles coloured so far (cache misses). */
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

    /**
     * Draws the visible part of level {@code lv}, with the flag tint when {@code tint}; returns the number of tiles
     * left for later frames (drawn from a coarser level meanwhile).
     */
    int draw(Graphics2D g, ViewTransform v, BlockMeanPyramid.Level lv, boolean tint) {
        deferredTiles = 0;
        int f = lv.scale();
        int lx0 = Math.max(0, (int) Math.floor(v.mapX(0) / f));
        int ly0 = Math.max(0, (int) Math.floor(v.mapY(0) / f));
        int lx1 = Math.min(lv.width(), (int) Math.ceil(v.mapX(v.width()) / f));
        int ly1 = Math.min(lv.height(), (int) Math.ceil(v.mapY(v.height()) / f));
        if (lx0 >= lx1 || ly0 >= ly1) {
            return 0;
        }
        int[] range = {lx0, ly0, lx1, ly1};
        int tx0 = lx0 / TILE;
        int tx1 = (lx1 - 1) / TILE;
        int ty0 = ly0 / TILE;
        int ty1 = (ly1 - 1) / TILE;
        BufferedImage[][] imgs = colourTiles(v, lv, tx0, ty0, tx1, ty1);
        for (int ty = ty0; ty <= ty1; ty++) {
            for (int tx = tx0; tx <= tx1; tx++) {
                BufferedImage img = imgs[ty - ty0][tx - tx0];
                if (img == null) {
                    drawStandIn(g, v, lv, tx, ty, range);
                } else {
                    drawTile(g, v, img, lv, tx, ty, range);
                }
            }
        }
        if (tint && flagWords != null) {
            BufferedImage[][] tintImgs = tintTiles(lv, tx0, ty0, tx1, ty1);
            for (int ty = ty0; ty <= ty1; ty++) {
                for (int tx = tx0; tx <= tx1; tx++) {
                    BufferedImage t = tintImgs[ty - ty0][tx - tx0];
                    if (t != NO_TINT) {
                        drawTile(g, v, t, lv, tx, ty, range);
                    }
                }
            }
        }
        return deferredTiles;
    }

    /**
     * Draws the part of tile ({@code tx}, {@code ty}) of {@code lv} inside the visible level-pixel range
     * {x0, y0, x1, y1}, nearest neighbour.
     */
    private static void drawTile(Graphics2D g, ViewTransform v, BufferedImage img, BlockMeanPyramid.Level lv, int tx,
                                 int ty, int[] range) {
        int f = lv.scale();
        int sx0 = Math.max(range[0], tx * TILE);
        int sy0 = Math.max(range[1], ty * TILE);
        int sx1 = Math.min(range[2], tx * TILE + img.getWidth());
        int sy1 = Math.min(range[3], ty * TILE + img.getHeight());
        g.drawImage(img, v.edgeX((double) sx0 * f), v.edgeY((double) sy0 * f), v.edgeX((double) sx1 * f),
                v.edgeY((double) sy1 * f), sx0 - tx * TILE, sy0 - ty * TILE, sx1 - tx * TILE, sy1 - ty * TILE, null);
    }

    /**
     * The coloured tiles of the range. Missing tiles are coloured in parallel, nearest the view centre first, at
     * most {@link #NEW_TILES_PER_FRAME} per frame; the others stay null and are counted in {@link #deferredTiles}.
     */
    private BufferedImage[][] colourTiles(ViewTransform v, BlockMeanPyramid.Level lv, int tx0, int ty0, int tx1,
                                          int ty1) {
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
            double cx = v.mapX(v.width() / 2.0) / lv.scale() / TILE - 0.5;
            double cy = v.mapY(v.height() / 2.0) / lv.scale() / TILE - 0.5;
            missing.sort(Comparator.comparingDouble(t -> Math.hypot(t[0] - cx, t[1] - cy)));
            missing = missing.subList(0, NEW_TILES_PER_FRAME);
        }
        Colouring c = colouring;
        BufferedImage[] made = missing.parallelStream().map(t -> colourTile(c, lv, t[0], t[1]))
                .toArray(BufferedImage[]::new);
        for (int i = 0; i < made.length; i++) {
            int[] t = missing.get(i);
            out[t[1] - ty0][t[0] - tx0] = made[i];
            tiles.put(TileCache.key(lv.index(), t[0], t[1]), made[i], bytes(made[i]));
        }
        tilesColoured += made.length;
        return out;
    }

    /**
     * Draws the visible part of tile ({@code tx}, {@code ty}) of {@code lv}, not yet coloured, from the first coarser
     * level whose covering tiles are cached (the coarsest level, one small tile, is coloured when needed).
     */
    private void drawStandIn(Graphics2D g, ViewTransform v, BlockMeanPyramid.Level lv, int tx, int ty, int[] range) {
        int f = lv.scale();
        int sx0 = Math.max(range[0], tx * TILE);
        int sy0 = Math.max(range[1], ty * TILE);
        int sx1 = Math.min(range[2], tx * TILE + TILE);
        int sy1 = Math.min(range[3], ty * TILE + TILE);
        int dx0 = v.edgeX((double) sx0 * f);
        int dy0 = v.edgeY((double) sy0 * f);
        Shape clip = g.getClip();
        g.clipRect(dx0, dy0, v.edgeX((double) sx1 * f) - dx0, v.edgeY((double) sy1 * f) - dy0);
        int top = pyramid.levelCount() - 1;
        for (int k = lv.index() + 1; k <= top && pyramid.level(k) != null; k++) {
            BlockMeanPyramid.Level c = pyramid.level(k);
            int d = k - lv.index();
            int[] coarse = {sx0 >> d, sy0 >> d, Math.min(c.width(), ((sx1 - 1) >> d) + 1),
                Math.min(c.height(), ((sy1 - 1) >> d) + 1)};
            List<BufferedImage> found = new ArrayList<>();
            List<int[]> at = new ArrayList<>();
            for (int cty = coarse[1] / TILE; cty <= (coarse[3] - 1) / TILE; cty++) {
                for (int ctx = coarse[0] / TILE; ctx <= (coarse[2] - 1) / TILE; ctx++) {
                    long key = TileCache.key(k, ctx, cty);
                    BufferedImage img = tiles.get(key);
                    if (img == null && k == top) {
                        img = colourTile(colouring, c, ctx, cty);
                        tiles.put(key, img, bytes(img));
                    }
                    if (img != null) {
                        found.add(img);
                        at.add(new int[] {ctx, cty});
                    }
                }
            }
            int needed = ((coarse[3] - 1) / TILE - coarse[1] / TILE + 1) * ((coarse[2] - 1) / TILE - coarse[0] / TILE + 1);
            if (found.size() == needed) {
                for (int i = 0; i < needed; i++) {
                    drawTile(g, v, found.get(i), c, at.get(i)[0], at.get(i)[1], coarse);
                }
                break;
            }
        }
        g.setClip(clip);
    }

    /** Tile ({@code tx}, {@code ty}) of {@code lv} in the colours of {@code c} (opaque). */
    static BufferedImage colourTile(Colouring c, BlockMeanPyramid.Level lv, int tx, int ty) {
        int x0 = tx * TILE;
        int y0 = ty * TILE;
        int w = Math.min(TILE, lv.width() - x0);
        int h = Math.min(TILE, lv.height() - y0);
        int[] px = new int[w * h];
        c.colourise(lv.samples(), lv.width(), x0, y0, w, h, px);
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        img.getRaster().setDataElements(0, 0, w, h, px); // a copy keeps the image eligible for acceleration
        return img;
    }

    /** The tint tiles of the range ({@link #NO_TINT} where nothing is flagged), computing missing ones in parallel. */
    private BufferedImage[][] tintTiles(BlockMeanPyramid.Level lv, int tx0, int ty0, int tx1, int ty1) {
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
        long[] words = flagWords;
        int mw = mapWidth;
        int mh = mapHeight;
        int rgb = flagRgb;
        FlagOverlay o = overlay;
        BufferedImage[] made = missing.parallelStream().map(t -> tintTile(words, mw, mh, lv, t[0], t[1], rgb, o))
                .toArray(BufferedImage[]::new);
        for (int i = 0; i < made.length; i++) {
            int[] t = missing.get(i);
            out[t[1] - ty0][t[0] - tx0] = made[i];
            tints.put(TileCache.key(lv.index(), t[0], t[1]), made[i], made[i] == NO_TINT ? 64 : bytes(made[i]));
        }
        return out;
    }

    /** Tint of one tile: alpha from the overlay and the tinted share of each level pixel; any tinted pixel shows. */
    private static BufferedImage tintTile(long[] words, int mw, int mh, BlockMeanPyramid.Level lv, int tx, int ty,
                                          int rgb, FlagOverlay overlay) {
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
            px[i] = frac[i] == 0 ? 0 : (overlay.alpha(frac[i]) << 24) | rgb;
        }
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_ARGB);
        img.getRaster().setDataElements(0, 0, w, h, px);
        return img;
    }

    private static long bytes(BufferedImage img) {
        return 4L * img.getWidth() * img.getHeight();
    }
}
