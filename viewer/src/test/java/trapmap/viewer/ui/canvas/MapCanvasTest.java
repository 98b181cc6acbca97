package trapmap.viewer.ui.canvas;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.awt.Graphics2D;
import java.awt.event.KeyEvent;
import java.awt.event.MouseEvent;
import java.awt.event.MouseWheelEvent;
import java.awt.geom.Line2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.BitSet;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.atomic.AtomicBoolean;
import org.junit.jupiter.api.Test;
import trapmap.maps.geometry.RoundWafer;
import trapmap.maps.io.ColourMap;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.BlockMeanPyramid;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.model.FlagOverlay;

/** Headless checks of the map canvas: view maths, painting into an off-screen image, flags and overlays. */
class MapCanvasTest {
    private static final DisplayStyle LINEAR_0_63 = new DisplayStyle(ColourMap.BLUE_YELLOW, false, 0, 63);

    /** An 8×8 map whose pixel (x, y) holds y·8 + x, pixel (7, 7) without data; pitch 0.5 mm. */
    private static WaferMap ramp() {
        float[] s = new float[64];
        for (int i = 0; i < 64; i++) {
            s[i] = i;
        }
        s[63] = Float.NaN;
        return SyntheticMaps.of(8, 8, 0.5, s);
    }

    private static MapCanvas canvas(WaferMap m, int w, int h, DisplayStyle style) {
        MapCanvas c = new MapCanvas();
        c.setSize(w, h);
        c.setMap(m);
        c.setStyle(style);
        c.awaitPyramid();
        c.fit();
        return c;
    }

    private static BufferedImage paint(MapCanvas c) {
        BufferedImage img = new BufferedImage(c.getWidth(), c.getHeight(), BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        c.paint(g);
        g.dispose();
        return img;
    }

    private static int at(BufferedImage img, double x, double y) {
        return img.getRGB((int) Math.floor(x), (int) Math.floor(y)) & 0xFFFFFF;
    }

    @Test
    void screenAndMapCoordinatesAreInverse() {
        MapCanvas c = canvas(ramp(), 400, 300, LINEAR_0_63);
        c.viewport().set(3.5, 2.25, 6.75);
        assertThat(c.screenX(2.25)).isEqualTo(200.0);
        assertThat(c.screenY(6.75)).isEqualTo(150.0);
        assertThat(c.screenX(3.25)).isCloseTo(203.5, within(1e-12));
        for (double sx : new double[] {0, 17.3, 399}) {
            assertThat(c.screenX(c.mapX(sx))).isCloseTo(sx, within(1e-9));
            assertThat(c.screenY(c.mapY(sx))).isCloseTo(sx, within(1e-9));
        }
    }

    @Test
    void fitShowsTheWholeMapCentred() {
        WaferMap m = SyntheticMaps.of(100, 50, 1, new float[5000]);
        MapCanvas c = canvas(m, 400, 300, LINEAR_0_63);
        assertThat(c.viewport().zoom()).isCloseTo(0.96 * 4, within(1e-12)); // width limits: 400 / 100
        assertThat(c.screenX(0) + c.screenX(100)).isCloseTo(400, within(1e-9));
        assertThat(c.screenY(0) + c.screenY(50)).isCloseTo(300, within(1e-9));
        assertThat(c.screenX(0)).isGreaterThanOrEqualTo(0);
        assertThat(c.screenX(100)).isLessThanOrEqualTo(400);
    }

    @Test
    void wheelZoomKeepsThePointUnderTheCursorFixed() {
        MapCanvas c = canvas(SyntheticMaps.wafer(256), 640, 480, LINEAR_0_63);
        double sx = 123;
        double sy = 321;
        double mx = c.mapX(sx);
        double my = c.mapY(sy);
        double z = c.viewport().zoom();
        MouseWheelEvent e = new MouseWheelEvent(c, MouseEvent.MOUSE_WHEEL, 0, 0, (int) sx, (int) sy, 0, false,
                MouseWheelEvent.WHEEL_UNIT_SCROLL, 1, -3);
        c.getMouseWheelListeners()[0].mouseWheelMoved(e);
        assertThat(c.viewport().zoom()).isCloseTo(z * Math.pow(1.2, 3), within(1e-9));
        assertThat(c.mapX(sx)).isCloseTo(mx, within(1e-9));
        assertThat(c.mapY(sy)).isCloseTo(my, within(1e-9));
    }

    @Test
    void keysZoomFitAndPan() {
        MapCanvas c = canvas(SyntheticMaps.wafer(256), 640, 480, LINEAR_0_63);
        double fit = c.viewport().zoom();
        press(c, KeyEvent.VK_PLUS);
        assertThat(c.viewport().zoom()).isCloseTo(fit * Math.sqrt(2), within(1e-9));
        double cx = c.viewport().centreX();
        press(c, KeyEvent.VK_RIGHT);
        assertThat(c.viewport().centreX()).isCloseTo(cx + 80 / c.viewport().zoom(), within(1e-9));
        press(c, KeyEvent.VK_0);
        assertThat(c.viewport().zoom()).isEqualTo(fit);
        assertThat(c.viewport().centreX()).isEqualTo(128.0);
    }

    private static void press(MapCanvas c, int key) {
        Object name = c.getInputMap(MapCanvas.WHEN_FOCUSED).get(javax.swing.KeyStroke.getKeyStroke(key, 0));
        c.getActionMap().get(name).actionPerformed(null);
    }

    @Test
    void highZoomDrawsEachMapPixelAsACrispSquareOfItsColour() {
        MapCanvas c = canvas(ramp(), 400, 400, LINEAR_0_63);
        c.viewport().set(40, 4, 4); // 40 screen pixels per map pixel: pixels 0..7 span screen 40..360
        BufferedImage img = paint(c);
        Colouring colours = new Colouring(LINEAR_0_63);
        for (int[] p : new int[][] {{0, 0}, {3, 2}, {5, 6}, {7, 0}}) {
            int value = p[1] * 8 + p[0];
            int expected = ColourMap.BLUE_YELLOW.rgb((int) Math.round(value * 255.0 / 63));
            assertThat(colours.rgb(value)).isEqualTo(expected);
            double left = c.screenX(p[0]);
            double top = c.screenY(p[1]);
            // every corner (one pixel in) and the centre of the square carry the same colour
            for (double[] d : new double[][] {{1, 1}, {38, 1}, {1, 38}, {38, 38}, {20, 20}}) {
                assertThat(at(img, left + d[0], top + d[1])).as("pixel %d,%d", p[0], p[1]).isEqualTo(expected);
            }
        }
        assertThat(at(img, c.screenX(7) + 20, c.screenY(7) + 20)).as("no data")
                .isEqualTo(Colouring.noDataRgb(ColourMap.BLUE_YELLOW));
        assertThat(at(img, 10, 200)).as("outside the map").isEqualTo(MapCanvas.BACKGROUND.getRGB() & 0xFFFFFF);
    }

    @Test
    void noDataColourDiffersFromEveryColourOfTheMap() {
        for (ColourMap m : ColourMap.values()) {
            int nd = Colouring.noDataRgb(m);
            for (int i = 0; i < 256; i++) {
                int c = m.rgb(i);
                int d = Math.abs((c >> 16 & 0xFF) - (nd >> 16 & 0xFF)) + Math.abs((c >> 8 & 0xFF) - (nd >> 8 & 0xFF))
                        + Math.abs((c & 0xFF) - (nd & 0xFF));
                assertThat(d).as("%s entry %d vs no-data colour", m, i).isGreaterThan(30);
            }
        }
    }

    @Test
    void pyramidLevelsAreMeansOfTheValidSamples() {
        float n = Float.NaN;
        // 5×3: blocks of 2×2, the last column and row are odd edges
        float[] s = {
            1, 3, n, n, 7,
            5, 7, n, n, 9,
            2, n, 4, 6, n,
        };
        BlockMeanPyramid p = pyramid(FloatRaster.wrap(5, 3, s));
        int[] counts = new int[6];
        BlockMeanPyramid.Level l1 = BlockMeanPyramid.halve(p.level(0), BlockMeanPyramid.Rule.EXACT_MEAN, null,
                counts);
        assertThat(counts).containsExactly(4, 0, 2, 1, 2, 0);
        assertThat(l1.width()).isEqualTo(3);
        assertThat(l1.height()).isEqualTo(2);
        float[] m = l1.samples();
        assertThat(m[0]).isEqualTo(4f); // (1 + 3 + 5 + 7) / 4
        assertThat(m[1]).isNaN(); // all four without data
        assertThat(m[2]).isEqualTo(8f); // (7 + 9) / 2, odd column
        assertThat(m[3]).isEqualTo(2f); // 2 alone (NaN beside it), odd row
        assertThat(m[4]).isEqualTo(5f); // (4 + 6) / 2
        assertThat(m[5]).isNaN();
        // level 2: the mean of the 7 valid map samples of the left 4×4 block, not the mean of the three means
        BlockMeanPyramid.Level l2 = BlockMeanPyramid.halve(l1, BlockMeanPyramid.Rule.EXACT_MEAN, counts, new int[2]);
        assertThat(l2.samples()).containsExactly((1 + 3 + 5 + 7 + 2 + 4 + 6) / 7f, 8f);
    }

    @Test
    void everyPyramidLevelHoldsTheMeanOfTheValidMapSamplesOfItsBlock() {
        int w = 300;
        int h = 170;
        SplittableRandom rnd = new SplittableRandom(11);
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = rnd.nextInt(4) == 0 ? Float.NaN : (float) rnd.nextDouble(1, 2);
        }
        BlockMeanPyramid p = pyramid(FloatRaster.wrap(w, h, s));
        p.build(new AtomicBoolean());
        BlockMeanPyramid.Level l3 = p.level(3);
        for (int[] cell : new int[][] {{0, 0}, {17, 9}, {37, 21}}) { // (37, 21) is the partial corner block
            double sum = 0;
            int n = 0;
            for (int y = cell[1] * 8; y < Math.min(h, cell[1] * 8 + 8); y++) {
                for (int x = cell[0] * 8; x < Math.min(w, cell[0] * 8 + 8); x++) {
                    if (!Float.isNaN(s[y * w + x])) {
                        sum += s[y * w + x];
                        n++;
                    }
                }
            }
            assertThat((double) l3.samples()[cell[1] * l3.width() + cell[0]]).isCloseTo(sum / n, within(1e-6));
        }
    }

    /**
     * The canvas's levels as it built them before it used the maps module's pyramid: each 2×2 block's mean of the
     * valid pixels, each weighted by its count of valid map samples. Kept here as the reference for the tiles.
     */
    private static List<float[]> formerCanvasLevels(float[] samples, int width, int height, int levels) {
        List<float[]> out = new ArrayList<>(List.of(samples));
        int[] counts = null;
        int fw = width;
        int fh = height;
        for (int k = 1; k < levels; k++) {
            float[] src = out.get(k - 1);
            int w = (fw + 1) / 2;
            int h = (fh + 1) / 2;
            float[] next = new float[w * h];
            int[] nextCounts = new int[w * h];
            for (int y = 0; y < h; y++) {
                for (int x = 0; x < w; x++) {
                    double sum = 0;
                    int n = 0;
                    for (int yy = 2 * y; yy <= Math.min(2 * y + 1, fh - 1); yy++) {
                        for (int xx = 2 * x; xx <= Math.min(2 * x + 1, fw - 1); xx++) {
                            float v = src[yy * fw + xx];
                            if (v == v) {
                                int c = counts == null ? 1 : counts[yy * fw + xx];
                                sum += (double) v * c;
                                n += c;
                            }
                        }
                    }
                    next[y * w + x] = n == 0 ? Float.NaN : (float) (sum / n);
                    nextCounts[y * w + x] = n;
                }
            }
            out.add(next);
            counts = nextCounts;
            fw = w;
            fh = h;
        }
        return out;
    }

    @Test
    void canvasTilesOfEveryLevelAreUnchangedByTheSharedPyramid() {
        int w = 700;
        int h = 530; // odd halvings: 700×530 → 350×265 → 175×133 → 88×67 → 44×34
        SplittableRandom rnd = new SplittableRandom(5);
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = rnd.nextInt(5) == 0 ? Float.NaN : (float) rnd.nextDouble(0, 63);
        }
        BlockMeanPyramid p = pyramid(FloatRaster.wrap(w, h, s));
        p.build(new AtomicBoolean());
        assertThat(p.levelCount()).isEqualTo(5);
        List<float[]> former = formerCanvasLevels(s, w, h, p.levelCount());
        Colouring colours = new Colouring(LINEAR_0_63);
        for (int k = 0; k < p.levelCount(); k++) {
            BlockMeanPyramid.Level lv = p.level(k);
            assertThat(lv.samples()).as("level %d", k).containsExactly(former.get(k));
            BlockMeanPyramid.Level reference = new BlockMeanPyramid.Level(k, lv.width(), lv.height(), former.get(k));
            for (int ty = 0; ty * TileLayer.TILE < lv.height(); ty++) {
                for (int tx = 0; tx * TileLayer.TILE < lv.width(); tx++) {
                    assertThat(pixels(TileLayer.colourTile(colours, lv, tx, ty)))
                            .as("level %d tile %d,%d", k, tx, ty)
                            .containsExactly(pixels(TileLayer.colourTile(colours, reference, tx, ty)));
                }
            }
        }
    }

    private static int[] pixels(BufferedImage img) {
        return img.getRGB(0, 0, img.getWidth(), img.getHeight(), null, 0, img.getWidth());
    }

    private static BlockMeanPyramid pyramid(FloatRaster r) {
        return new BlockMeanPyramid(r, BlockMeanPyramid.Rule.EXACT_MEAN,
                BlockMeanPyramid.levelsUntil(r.width(), r.height(), MapCanvas.PYRAMID_TOP_SIDE));
    }

    @Test
    void tileCacheEvictsTheLeastRecentlyUsedBeyondItsMemory() {
        TileCache<String> cache = new TileCache<>(300);
        cache.put(TileCache.key(0, 0, 0), "a", 100);
        cache.put(TileCache.key(0, 1, 0), "b", 100);
        cache.put(TileCache.key(0, 2, 0), "c", 100);
        assertThat(cache.get(TileCache.key(0, 0, 0))).isEqualTo("a"); // a is now the most recent
        cache.put(TileCache.key(1, 0, 0), "d", 100);
        assertThat(cache.get(TileCache.key(0, 1, 0))).isNull();
        assertThat(cache.get(TileCache.key(0, 0, 0))).isEqualTo("a");
        assertThat(cache.bytes()).isEqualTo(300);
        cache.clear();
        assertThat(cache.size()).isZero();
    }

    @Test
    void pyramidStopsAtASmallTopLevel() {
        BlockMeanPyramid p = pyramid(FloatRaster.filled(1000, 300, 1f));
        p.build(new AtomicBoolean());
        assertThat(p.complete()).isTrue();
        BlockMeanPyramid.Level top = p.level(p.levelCount() - 1);
        assertThat(Math.max(top.width(), top.height())).isLessThanOrEqualTo(MapCanvas.PYRAMID_TOP_SIDE);
        assertThat(top.width()).isEqualTo(63); // 1000 → 500 → 250 → 125 → 63
    }

    @Test
    void levelIsTheCoarsestWhosePixelsAreNotLargerThanAScreenPixel() {
        assertThat(MapCanvas.levelFor(3, 7)).isZero();
        assertThat(MapCanvas.levelFor(1, 7)).isZero();
        assertThat(MapCanvas.levelFor(0.75, 7)).isZero();
        assertThat(MapCanvas.levelFor(0.5, 7)).isEqualTo(1);
        assertThat(MapCanvas.levelFor(0.244, 7)).isEqualTo(2);
        assertThat(MapCanvas.levelFor(1e-4, 7)).isEqualTo(6);
    }

    @Test
    void flagMatchesABruteForceLoop() {
        int w = 301;
        int h = 97;
        SplittableRandom rnd = new SplittableRandom(5);
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = rnd.nextInt(10) == 0 ? Float.NaN : (float) rnd.nextDouble(0, 100);
        }
        FloatRaster r = FloatRaster.wrap(w, h, s);
        Mask mask = Mask.of(w, h, i -> (i * 7919) % 5 != 0);
        s[7] = 42.5f;
        s[8] = Math.nextUp(42.3f);
        s[9] = 42.3f;
        s[10] = Float.POSITIVE_INFINITY;
        s[11] = Float.intBitsToFloat(0xFFC00000); // NaN with the sign bit set
        // thresholds exactly representable as float, between two floats, and beyond the float range
        for (double threshold : new double[] {42.5, 42.3, (double) 42.3f, 1e300, -1e300, Double.POSITIVE_INFINITY}) {
            for (boolean above : new boolean[] {true, false}) {
                for (Mask m : new Mask[] {null, mask}) {
                    BitSet expected = new BitSet();
                    for (int i = 0; i < s.length; i++) {
                        boolean hit = above ? s[i] > threshold : s[i] < threshold;
                        if (hit && (m == null || m.containsIndex(i))) {
                            expected.set(i);
                        }
                    }
                    assertThat(MapCanvas.flag(r, m, threshold, above)).as("%s %s", threshold, above)
                            .isEqualTo(expected);
                }
            }
        }
    }

    @Test
    void flaggedFractionsMatchABruteForceCount() {
        int w = 203;
        int h = 150;
        SplittableRandom rnd = new SplittableRandom(9);
        BitSet b = new BitSet();
        for (int i = 0; i < w * h; i++) {
            if (rnd.nextInt(3) == 0) {
                b.set(i);
            }
        }
        long[] words = b.toLongArray();
        for (int level : new int[] {0, 1, 3, 6, 7}) {
            int f = 1 << level;
            int lw = (w + f - 1) / f;
            int lh = (h + f - 1) / f;
            float[] out = new float[lw * lh];
            Flags.fractions(words, w, h, level, 0, 0, lw, lh, out);
            for (int y = 0; y < lh; y++) {
                for (int x = 0; x < lw; x++) {
                    int n = 0;
                    int all = 0;
                    for (int my = y * f; my < Math.min(h, (y + 1) * f); my++) {
                        for (int mx = x * f; mx < Math.min(w, (x + 1) * f); mx++) {
                            all++;
                            n += b.get(my * w + mx) ? 1 : 0;
                        }
                    }
                    assertThat(out[y * lw + x]).as("level %d cell %d,%d", level, x, y).isEqualTo((float) n / all);
                }
            }
        }
    }

    @Test
    void logScaleSpreadsDecadesEvenly() {
        DisplayStyle log = new DisplayStyle(ColourMap.HEAT, true, 1, 1000);
        Colouring c = new Colouring(log);
        ColourMap m = ColourMap.HEAT;
        assertThat(c.rgb(1)).isEqualTo(m.rgb(0));
        assertThat(c.rgb(1000)).isEqualTo(m.rgb(255));
        assertThat(c.rgb(0.01)).isEqualTo(m.rgb(0));
        assertThat(c.rgb(1e9)).isEqualTo(m.rgb(255));
        assertThat(c.rgb(10)).isEqualTo(m.rgb(85)); // one decade of three: 255 / 3
        assertThat(c.rgb(100)).isEqualTo(m.rgb(170));
        assertThat(c.rgb(0)).isEqualTo(Colouring.noDataRgb(m));
        assertThat(c.rgb(-5)).isEqualTo(Colouring.noDataRgb(m));
        assertThat(c.rgb(Double.NaN)).isEqualTo(Colouring.noDataRgb(m));
        // every value agrees with the direct formula round(255 · log(v / low) / log(high / low)) away from a bound
        SplittableRandom rnd = new SplittableRandom(3);
        for (int i = 0; i < 20000; i++) {
            float v = (float) Math.pow(10, rnd.nextDouble(-1, 4));
            double p = 255 * Math.log10(v) / 3;
            if (Math.abs(p - Math.floor(p) - 0.5) < 1e-4) {
                continue;
            }
            int k = (int) Math.max(0, Math.min(255, Math.round(p)));
            assertThat(c.rgb(v)).as("value %s", v).isEqualTo(m.rgb(k));
        }
        float[] src = {0.5f, 1, 10, 100, 1000, 2000, Float.NaN, -1};
        int[] out = new int[src.length];
        c.colourise(src, src.length, 0, 0, src.length, 1, out);
        for (int i = 0; i < src.length; i++) {
            assertThat(out[i]).isEqualTo(c.rgb(src[i]));
        }
    }

    @Test
    void styleChangeRecoloursTheCachedTiles() {
        MapCanvas c = canvas(ramp(), 400, 400, LINEAR_0_63);
        c.viewport().set(40, 4, 4);
        BufferedImage first = paint(c);
        int coloured = c.tilesColoured();
        assertThat(coloured).isEqualTo(1);
        paint(c);
        assertThat(c.tilesColoured()).as("second frame from the cache").isEqualTo(coloured);
        DisplayStyle grey = new DisplayStyle(ColourMap.GREY, false, 0, 63);
        c.setStyle(grey);
        BufferedImage second = paint(c);
        assertThat(c.tilesColoured()).isEqualTo(coloured + 1);
        int px = (int) c.screenX(3.5);
        int py = (int) c.screenY(2.5);
        assertThat(at(first, px, py)).isEqualTo(ColourMap.BLUE_YELLOW.rgb((int) Math.round(19 * 255.0 / 63)));
        assertThat(at(second, px, py)).isEqualTo(ColourMap.GREY.rgb((int) Math.round(19 * 255.0 / 63)));
    }

    @Test
    void tilesBeyondTheFrameBudgetAreDrawnFromACoarserLevelThenCompleted() {
        WaferMap m = SyntheticMaps.wafer(2048);
        MapCanvas c = canvas(m, 1600, 1000, new DisplayStyle(ColourMap.SEA, true, 30, 1000));
        c.viewport().set(1, 1024, 1024); // level 0, 7 × 5 tiles visible
        BufferedImage img = paint(c);
        assertThat(c.deferredTiles()).isGreaterThan(0);
        // the budget, plus the one small tile of the coarsest level coloured for the stand-ins
        assertThat(c.tilesColoured()).isLessThanOrEqualTo(TileLayer.NEW_TILES_PER_FRAME + 1);
        assertThat(at(img, 2, 2)).as("stand-in drawn, not background").isNotEqualTo(MapCanvas.BACKGROUND.getRGB()
                & 0xFFFFFF);
        int frames = 1;
        while (c.deferredTiles() > 0) {
            int before = c.tilesColoured();
            img = paint(c);
            assertThat(c.tilesColoured() - before).isLessThanOrEqualTo(TileLayer.NEW_TILES_PER_FRAME);
            frames++;
        }
        assertThat(frames).isBetween(2, 4);
        Colouring colours = new Colouring(c.style());
        for (int[] p : new int[][] {{2, 2}, {1598, 998}, {800, 500}}) {
            int x = (int) Math.floor(c.mapX(p[0] + 0.5));
            int y = (int) Math.floor(c.mapY(p[1] + 0.5));
            assertThat(at(img, p[0], p[1])).isEqualTo(colours.rgb(m.raster().get(x, y)));
        }
    }

    @Test
    void flaggedPixelsAreOutlinedAtHighZoomAndTintedWhenZoomedOut() {
        WaferMap m = ramp();
        MapCanvas c = canvas(m, 400, 400, LINEAR_0_63);
        BitSet flagged = MapCanvas.flag(m.raster(), null, 45.5, true); // 46..62: rows 5-7, (7,7) has no data
        c.setFlagOverlay(new FlagOverlay(FlagOverlay.Mode.OUTLINE, 1));
        c.setFlagged(flagged);
        c.viewport().set(40, 4, 4);
        BufferedImage img = paint(c);
        int flag = Overlays.FLAG_COLOUR.getRGB() & 0xFFFFFF;
        // pixel (6, 5) = 46 is flagged and its left neighbour 45 is not: an edge on its left side, none inside
        assertThat(at(img, c.screenX(6) + 0.5, c.screenY(5) + 20)).isEqualTo(flag);
        assertThat(at(img, c.screenX(6) + 20, c.screenY(5) + 20)).isNotEqualTo(flag);
        // an unflagged pixel far from the flags has none
        assertThat(at(img, c.screenX(1) + 0.5, c.screenY(1) + 20)).isNotEqualTo(flag);

        c.viewport().set(2, 4, 4); // below the outline zoom: tint
        img = paint(c);
        int tinted = at(img, c.screenX(3.5), c.screenY(6.5));
        int plain = new Colouring(LINEAR_0_63).rgb(54);
        assertThat(tinted).isNotEqualTo(plain);
        assertThat(tinted >> 16 & 0xFF).as("red rises towards the tint").isGreaterThan(plain >> 16 & 0xFF);
        assertThat(at(img, c.screenX(3.5), c.screenY(1.5))).isEqualTo(new Colouring(LINEAR_0_63).rgb(11));
    }

    @Test
    void zoomedOutAnOutlineTintsOnlyTheEdgeOfTheFlaggedPixelsAFillAllOfThemAndOffNone() {
        WaferMap m = ramp();
        MapCanvas c = canvas(m, 400, 400, LINEAR_0_63);
        c.setFlagged(MapCanvas.flag(m.raster(), null, 45.5, true)); // 46..62: rows 5-7 from (6, 5) on
        c.viewport().set(2, 4, 4);
        Colouring plain = new Colouring(LINEAR_0_63);
        assertThat(c.flagOverlay()).isEqualTo(FlagOverlay.DEFAULT);
        BufferedImage img = paint(c);
        // (6, 6) = 54 has flagged pixels on all four sides: inside the region, so the outline leaves it alone
        assertThat(at(img, c.screenX(6.5), c.screenY(6.5))).isEqualTo(plain.rgb(54));
        // (3, 6) = 51 lies below an unflagged pixel: on the edge, tinted
        assertThat(at(img, c.screenX(3.5), c.screenY(6.5))).isNotEqualTo(plain.rgb(51));

        c.setFlagOverlay(FlagOverlay.DEFAULT.withMode(FlagOverlay.Mode.FILL));
        img = paint(c);
        assertThat(at(img, c.screenX(6.5), c.screenY(6.5))).isNotEqualTo(plain.rgb(54));

        c.setFlagOverlay(FlagOverlay.DEFAULT.withMode(FlagOverlay.Mode.OFF));
        img = paint(c);
        assertThat(at(img, c.screenX(3.5), c.screenY(6.5))).isEqualTo(plain.rgb(51));
    }

    @Test
    void probeReportsThePixelUnderTheCursorAndNullOffTheMap() {
        MapCanvas c = canvas(ramp(), 400, 400, LINEAR_0_63);
        c.viewport().set(40, 4, 4);
        List<MapCanvas.Probe> seen = new ArrayList<>();
        c.onProbe(seen::add);
        MouseEvent move = new MouseEvent(c, MouseEvent.MOUSE_MOVED, 0, 0, (int) c.screenX(2.5), (int) c.screenY(6.5),
                0, false);
        c.getMouseMotionListeners()[0].mouseMoved(move);
        c.getMouseMotionListeners()[0].mouseMoved(new MouseEvent(c, MouseEvent.MOUSE_MOVED, 0, 0, 5, 5, 0, false));
        assertThat(seen).hasSize(2);
        MapCanvas.Probe p = seen.get(0);
        assertThat(p.xPx()).isEqualTo(2);
        assertThat(p.yPx()).isEqualTo(6);
        assertThat(p.value()).isEqualTo(50.0);
        assertThat(p.xMm()).isCloseTo((2 - 3.5) * 0.5, within(1e-12)); // centred grid, pitch 0.5 mm
        assertThat(p.yMm()).isCloseTo((3.5 - 6) * 0.5, within(1e-12));
        assertThat(seen.get(1)).isNull();
    }

    @Test
    void lineToolReportsTheDraggedLineInMillimetresAndEscapeCancels() {
        MapCanvas c = canvas(ramp(), 400, 400, LINEAR_0_63);
        c.viewport().set(40, 4, 4);
        c.setLineTool(true);
        List<Line2D> lines = new ArrayList<>();
        c.onLineDrawn(lines::add);
        var mouse = c.getMouseListeners()[0];
        var motion = c.getMouseMotionListeners()[0];
        int x0 = (int) c.screenX(0.5);
        int y0 = (int) c.screenY(0.5);
        int x1 = (int) c.screenX(7.5);
        int y1 = (int) c.screenY(7.5);
        mouse.mousePressed(button(c, MouseEvent.MOUSE_PRESSED, x0, y0));
        motion.mouseDragged(button(c, MouseEvent.MOUSE_DRAGGED, x1, y1));
        mouse.mouseReleased(button(c, MouseEvent.MOUSE_RELEASED, x1, y1));
        assertThat(lines).hasSize(1);
        Line2D l = lines.get(0);
        // pixel centres (0, 0) and (7, 7) of the centred 8×8 grid at 0.5 mm: ±1.75 mm
        assertThat(l.getX1()).isCloseTo(-1.75, within(0.02));
        assertThat(l.getY1()).isCloseTo(1.75, within(0.02));
        assertThat(l.getX2()).isCloseTo(1.75, within(0.02));
        assertThat(l.getY2()).isCloseTo(-1.75, within(0.02));

        mouse.mousePressed(button(c, MouseEvent.MOUSE_PRESSED, x0, y0));
        motion.mouseDragged(button(c, MouseEvent.MOUSE_DRAGGED, x1, y0));
        press(c, KeyEvent.VK_ESCAPE);
        mouse.mouseReleased(button(c, MouseEvent.MOUSE_RELEASED, x1, y0));
        assertThat(lines).hasSize(1);
    }

    private static MouseEvent button(MapCanvas c, int id, int x, int y) {
        return new MouseEvent(c, id, 0, MouseEvent.BUTTON1_DOWN_MASK, x, y, 1, false, MouseEvent.BUTTON1);
    }

    @Test
    void zoomToMmShowsTheRectangle() {
        MapCanvas c = canvas(SyntheticMaps.wafer(400), 600, 400, LINEAR_0_63); // pitch 0.4 mm
        c.zoomToMm(10, -5, 30, 15);
        // 20 mm = 50 px square → 0.9 · 400 / 50 screen px per map px
        assertThat(c.viewport().zoom()).isCloseTo(0.9 * 400 / 50, within(1e-9));
        var t = c.mmToScreen();
        java.awt.geom.Point2D centre = t.transform(new java.awt.geom.Point2D.Double(20, 5), null);
        assertThat(centre.getX()).isCloseTo(300, within(1e-9));
        assertThat(centre.getY()).isCloseTo(200, within(1e-9));
    }

    @Test
    void aZoomAskedForBeforeTheCanvasHasASizeHappensAtTheFirstFrame() {
        MapCanvas c = new MapCanvas();
        c.setMap(SyntheticMaps.wafer(400));
        c.setStyle(LINEAR_0_63);
        c.awaitPyramid();
        c.zoomToMm(10, -5, 30, 15);
        c.setSize(600, 400);
        paint(c);
        assertThat(c.viewport().zoom()).isCloseTo(0.9 * 400 / 50, within(1e-9));
    }

    @Test
    void waferOutlineIsTracedAtTheEdgeAndTheExclusionInside() {
        RoundWafer disk = RoundWafer.disk(150);
        java.awt.geom.PathIterator it = OutlinePath.trace(disk, 0).getPathIterator(null);
        double[] p = new double[6];
        int n = 0;
        while (!it.isDone()) {
            if (it.currentSegment(p) != java.awt.geom.PathIterator.SEG_CLOSE) {
                assertThat(Math.hypot(p[0], p[1])).isCloseTo(75, within(1e-6));
                n++;
            }
            it.next();
        }
        assertThat(n).isEqualTo(OutlinePath.RAYS);
        java.awt.geom.Rectangle2D inner = OutlinePath.trace(disk, 3).getBounds2D();
        assertThat(inner.getWidth()).isCloseTo(144, within(1e-3));
        assertThat(OutlinePath.trace(disk, 80)).isNull();
    }

    @Test
    void overlaysPaintWithoutAMapStyleAndWithoutAMap() {
        MapCanvas c = new MapCanvas();
        c.setSize(200, 100);
        assertThat(at(paint(c), 5, 5)).isEqualTo(MapCanvas.BACKGROUND.getRGB() & 0xFFFFFF);
        c.setMap(ramp());
        c.awaitPyramid();
        c.setOutline(RoundWafer.disk(4), 0.5);
        c.setLine(new Line2D.Double(-1, -1, 1, 1));
        paint(c); // no style yet: background and message only
        c.setStyle(LINEAR_0_63);
        BufferedImage img = paint(c);
        assertThat(c.lastFrameMillis()).isGreaterThan(0);
        assertThat(at(img, 100, 50)).isNotEqualTo(MapCanvas.BACKGROUND.getRGB() & 0xFFFFFF);
    }

    @Test
    void scaleBarLengthsAreRound() {
        assertThat(Overlays.niceLength(37)).isEqualTo(20.0);
        assertThat(Overlays.niceLength(7.3)).isEqualTo(5.0);
        assertThat(Overlays.niceLength(0.13)).isCloseTo(0.1, within(1e-12));
        assertThat(Overlays.formatMm(20)).isEqualTo("20 mm");
        assertThat(Overlays.formatMm(0.5)).isEqualTo("500 µm");
    }
}
