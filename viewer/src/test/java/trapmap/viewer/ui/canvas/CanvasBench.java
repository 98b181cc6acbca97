package trapmap.viewer.ui.canvas;

import java.awt.Graphics2D;
import java.awt.geom.Line2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.BitSet;
import java.util.List;
import java.util.Locale;
import trapmap.maps.geometry.Fiducial;
import trapmap.maps.geometry.RoundWafer;
import trapmap.maps.io.ColourMap;
import trapmap.maps.model.WaferMap;
import trapmap.viewer.graphics.DisplayStyle;

/**
 * Frame times of {@link MapCanvas} painting a synthetic 4096² wafer map, with wafer outline, edge-exclusion line and
 * profile line, into a 1600×1000 off-screen image through its real paint path (run by {@code scripts/bench-viewer}).
 * Prints median, 95th percentile, maximum and minimum per scenario (the minimum is the least disturbed by other
 * programs on the machine):
 * <ul>
 *   <li>zoom: 24 frames from the fitted view to 64 screen pixels per map pixel about off-centre points, with an
 *       empty tile cache (cold) and then again (warm);</li>
 *   <li>pan: 60 frames of 40-screen-pixel steps at several zooms (tiles coloured as they come into view);</li>
 *   <li>threshold: flag all pixels below a threshold ({@link MapCanvas#flag}) and repaint, at the fitted view
 *       (tint) and zoomed in (outlines), for 20 thresholds; flag alone is shown too;</li>
 *   <li>worst case for the flag overlays: half the pixels flagged at random, small pans at four zooms.</li>
 * </ul>
 * Arguments: map side (default 4096), rounds (default 3; the first is a warm-up and not reported).
 */
public final class CanvasBench {
    private static final int W = 1600;
    private static final int H = 1000;

    private final MapCanvas canvas = new MapCanvas();
    private final BufferedImage frame = new BufferedImage(W, H, BufferedImage.TYPE_INT_RGB);
    private final WaferMap map;
    private int deferredFrames;

    private CanvasBench(WaferMap map) {
        this.map = map;
        canvas.setSize(W, H);
        canvas.setMap(map);
        canvas.awaitPyramid();
        canvas.setOutline(RoundWafer.of(156, new Fiducial.Notch(1, 90)), 3);
        canvas.setLine(new Line2D.Double(-60, -10, 50, 40));
    }

    public static void main(String[] args) {
        int n = args.length > 0 ? Integer.parseInt(args[0]) : 4096;
        int rounds = args.length > 1 ? Integer.parseInt(args[1]) : 3;
        long t0 = System.nanoTime();
        WaferMap map = SyntheticMaps.wafer(n);
        System.out.printf(Locale.ROOT, "map %dx%d generated in %.0f ms; view %dx%d; %d cores; load average %.1f%n", n,
                n, (System.nanoTime() - t0) / 1e6, W, H, Runtime.getRuntime().availableProcessors(), load());
        long p0 = System.nanoTime();
        CanvasBench b = new CanvasBench(map);
        System.out.printf(Locale.ROOT, "pyramid built in %.0f ms (first run, includes JIT warm-up)%n",
                (System.nanoTime() - p0) / 1e6);
        for (int r = 0; r < rounds; r++) {
            boolean report = r > 0 || rounds == 1;
            if (report) {
                System.out.println("round " + r + (CPU ? " (CPU ms of one thread" : " (wall-clock ms")
                        + " per frame: median / p95 / max / min, frames)");
            }
            b.run(report, r);
        }
        System.out.printf(Locale.ROOT, "load average at the end %.1f (above the core count, other programs share the"
                + " cores and the times grow accordingly)%n", load());
    }

    /**
     * With {@code -Dbench.cpu=true} (and the common fork-join pool at parallelism 0, so that all work runs on the
     * calling thread) frames are timed by the CPU time of this thread: one core's work per frame, little affected by
     * other programs on the machine. Otherwise wall-clock time.
     */
    private static final boolean CPU = Boolean.getBoolean("bench.cpu");
    private static final java.lang.management.ThreadMXBean THREADS =
            java.lang.management.ManagementFactory.getThreadMXBean();

    private static long now() {
        return CPU ? THREADS.getCurrentThreadCpuTime() : System.nanoTime();
    }

    private static double load() {
        return java.lang.management.ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage();
    }

    private void run(boolean report, int round) {
        // a new style empties the tile cache: the first pass is cold
        canvas.setStyle(new DisplayStyle(round % 2 == 0 ? ColourMap.BLUE_YELLOW : ColourMap.HEAT, true, 30 + round,
                1000));
        canvas.setFlagged(null);
        double[] coldComplete = new double[24];
        deferredFrames = 0;
        double[] cold = zoomSequence(coldComplete);
        int coldExtra = deferredFrames;
        double[] warm = zoomSequence(null);
        double[] pan = pans();
        double[] flagOnly = new double[20];
        double[] thresholdFit = thresholds(false, flagOnly);
        double[] thresholdZoomed = thresholds(true, null);
        double[] noisy = noisyFlags();
        if (report) {
            print("zoom, cold tile cache", cold);
            print("  same, until the view is in full detail", coldComplete);
            System.out.println("    (" + coldExtra + " extra frames for tiles deferred to later frames)");
            print("zoom, warm tile cache", warm);
            print("pan", pan);
            print("flag() alone, 16 MP", flagOnly);
            print("threshold: flag + repaint, fitted (tint)", thresholdFit);
            print("threshold: flag + repaint, zoomed (outlines)", thresholdZoomed);
            print("half the pixels flagged at random, warm", noisy);
        }
    }

    /** Frame times of a zoom sequence; {@code untilComplete} gets the time until each view is in full detail. */
    private double[] zoomSequence(double[] untilComplete) {
        canvas.fit();
        double[] t = new double[24];
        double factor = Math.pow(64 / canvas.viewport().zoom(), 1 / 23.0);
        for (int i = 0; i < t.length; i++) {
            if (i > 0) {
                canvas.zoomAbout(factor, W * 0.55, H * 0.45);
            }
            t[i] = paint();
            double total = t[i];
            while (canvas.deferredTiles() > 0) {
                total += paint();
                deferredFrames++;
            }
            if (untilComplete != null) {
                untilComplete[i] = total;
            }
        }
        return t;
    }

    private double[] pans() {
        List<Double> t = new ArrayList<>();
        for (double zoomOverFit : new double[] {1.5, 4, 17, 100}) {
            canvas.fit();
            canvas.zoomBy(zoomOverFit);
            paint();
            for (int i = 0; i < 15; i++) {
                canvas.panBy(40, i % 3 == 0 ? 25 : -10);
                t.add(paint());
            }
        }
        return t.stream().mapToDouble(Double::doubleValue).toArray();
    }

    private double[] thresholds(boolean zoomed, double[] flagOnly) {
        canvas.fit();
        if (zoomed) {
            canvas.zoomAbout(40, W * 0.5, H * 0.5);
        }
        paint();
        double[] t = new double[20];
        for (int i = 0; i < t.length; i++) {
            double threshold = 100 + 30 * i;
            long s = now();
            BitSet bits = MapCanvas.flag(map.raster(), null, threshold, false);
            long f = now();
            canvas.setFlagged(bits);
            paint();
            t[i] = (now() - s) / 1e6;
            if (flagOnly != null) {
                flagOnly[i] = (f - s) / 1e6;
            }
        }
        canvas.setFlagged(null);
        return t;
    }

    /** Worst case for the flag overlays: every pixel flagged with probability 1/2, frames at several zooms. */
    private double[] noisyFlags() {
        BitSet noisy = new BitSet(map.width() * map.height());
        java.util.SplittableRandom rnd = new java.util.SplittableRandom(17);
        for (int i = 0; i < map.width() * map.height(); i++) {
            if (rnd.nextBoolean()) {
                noisy.set(i);
            }
        }
        canvas.setFlagged(noisy);
        List<Double> t = new ArrayList<>();
        for (double zoomOverFit : new double[] {1, 4, 17, 50}) {
            canvas.fit();
            canvas.zoomBy(zoomOverFit);
            paint();
            for (int i = 0; i < 5; i++) {
                canvas.panBy(3, 2);
                t.add(paint());
            }
        }
        canvas.setFlagged(null);
        return t.stream().mapToDouble(Double::doubleValue).toArray();
    }

    private double paint() {
        Graphics2D g = frame.createGraphics();
        long s = now();
        canvas.paint(g);
        double ms = (now() - s) / 1e6;
        g.dispose();
        return ms;
    }

    private static void print(String what, double[] ms) {
        double[] s = ms.clone();
        Arrays.sort(s);
        System.out.printf(Locale.ROOT, "  %-46s %6.1f / %6.1f / %6.1f / %6.1f  (%d)%n", what, quantile(s, 0.5),
                quantile(s, 0.95), s[s.length - 1], s[0], s.length);
    }

    /** Nearest-rank quantile of sorted values. */
    private static double quantile(double[] sorted, double q) {
        int i = (int) Math.ceil(q * sorted.length) - 1;
        return sorted[Math.max(0, Math.min(sorted.length - 1, i))];
    }
}
