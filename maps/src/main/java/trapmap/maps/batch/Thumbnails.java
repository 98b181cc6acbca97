package trapmap.maps.batch;

import java.awt.image.BufferedImage;
import java.awt.image.DataBufferInt;
import java.io.IOException;
import java.nio.file.Path;
import java.util.BitSet;
import trapmap.maps.io.Caption;
import trapmap.maps.io.CaptionedPicture;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.PngFiles;
import trapmap.maps.io.PngStyle;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

/** Batch thumbnails: a small picture of the lifetime map with the flagged regions outlined. */
public final class Thumbnails {
    /** Longest side of a thumbnail, px. */
    public static final int THUMBNAIL_PX = 256;
    /** Colour of flagged-region outlines in thumbnails (opaque magenta, ARGB). */
    public static final int OUTLINE_ARGB = 0xFFFF00FF;
    /** Width of the outline around flagged regions in thumbnails, px. */
    public static final int OUTLINE_PX = 2;
    /** Percentiles of the evaluated lifetimes that span a thumbnail's colours. */
    static final double LOW_PERCENT = 1;
    static final double HIGH_PERCENT = 99;

    private Thumbnails() {
    }

    /**
     * A thumbnail of {@link #THUMBNAIL_PX} px along its longer side (smaller maps are enlarged): the map sampled at
     * the centre of each thumbnail pixel (nearest neighbour), drawn in the default colours over
     * {@code [lowUs, highUs]} (NaN: the picture's own range), with a line {@link #OUTLINE_PX} px wide in
     * {@link #OUTLINE_ARGB} drawn just outside each flagged region, so that the region itself keeps its colours. A
     * thumbnail pixel counts as flagged when any map pixel in it is flagged, so no region is too small to be seen.
     */
    static BufferedImage thumbnail(WaferMap map, BitSet flagged, double lowUs, double highUs) {
        return thumbnail(map, flagged, lowUs, highUs, false);
    }

    /**
     * The thumbnail, with {@code caption}: a small caption strip below it ({@link CaptionedPicture#SMALL_STRIP_PX}
     * px) naming the wafer and the quantity with its unit, no date, so that it is the same in every run.
     */
    static BufferedImage thumbnail(WaferMap map, BitSet flagged, double lowUs, double highUs, boolean caption) {
        BufferedImage img = picture(map, flagged, lowUs, highUs);
        return caption ? CaptionedPicture.withSmallCaption(img, Caption.of(map)) : img;
    }

    private static BufferedImage picture(WaferMap map, BitSet flagged, double lowUs, double highUs) {
        int w = map.width();
        int h = map.height();
        double scale = (double) Math.max(w, h) / THUMBNAIL_PX; // map pixels per thumbnail pixel
        int tw = Math.max(1, (int) Math.round(w / scale));
        int th = Math.max(1, (int) Math.round(h / scale));
        int[] sx = new int[tw];
        int[] sy = new int[th];
        for (int tx = 0; tx < tw; tx++) {
            sx[tx] = Math.min(w - 1, (int) ((tx + 0.5) * scale));
        }
        for (int ty = 0; ty < th; ty++) {
            sy[ty] = Math.min(h - 1, (int) ((ty + 0.5) * scale));
        }
        float[] small = new float[tw * th];
        boolean[] hit = new boolean[tw * th];
        sample(map.raster().samples(), flagged, w, sx, sy, small, hit);
        markFlagged(flagged, w, scale, tw, th, hit);
        PixelGrid g = map.grid();
        PixelGrid sg = new PixelGrid(tw, th, g.pitchMm() * scale, (g.centreXPx() + 0.5) / scale - 0.5,
                (g.centreYPx() + 0.5) / scale - 0.5);
        PngStyle style = PngStyle.DEFAULT;
        if (lowUs > 0 && highUs > lowUs) {
            style = style.withRange(lowUs, highUs);
        }
        BufferedImage out = MapFiles.picture(new WaferMap(FloatRaster.wrap(tw, th, small), sg, map.quantity(),
                map.waferId(), map.conditions(), map.provenance()), style);
        outline(((DataBufferInt) out.getRaster().getDataBuffer()).getData(), dilate(hit, tw, th, OUTLINE_PX), hit,
                tw);
        return out;
    }

    // The loops of a thumbnail are small methods of their own, called per row: a loop over a whole picture runs long
    // once per wafer, so HotSpot compiles its method while it runs (on-stack replacement) and again at its next call;
    // a small method called per row is compiled quickly, once.

    /** The map's value and flag at the thumbnail pixels' centres ({@code sx}, {@code sy}: map column and row). */
    private static void sample(float[] s, BitSet flagged, int w, int[] sx, int[] sy, float[] small, boolean[] hit) {
        for (int ty = 0; ty < sy.length; ty++) {
            sampleRow(s, flagged, sy[ty] * w, sx, small, hit, ty * sx.length);
        }
    }

    /** One thumbnail row of {@link #sample}: map row from pixel {@code row}, thumbnail row from pixel {@code at}. */
    private static void sampleRow(float[] s, BitSet flagged, int row, int[] sx, float[] small, boolean[] hit, int at) {
        for (int tx = 0; tx < sx.length; tx++) {
            int i = row + sx[tx];
            small[at + tx] = s[i];
            hit[at + tx] = flagged.get(i);
        }
    }

    /** Map rows per call of {@link #markFlagged(BitSet, int, double, int, int, boolean[], int, int)}. */
    private static final int MARK_ROWS = 8;

    /** Marks the thumbnail pixel of every flagged map pixel ({@code scale} map pixels per thumbnail pixel). */
    static void markFlagged(BitSet flagged, int w, double scale, int tw, int th, boolean[] hit) {
        int n = flagged.length();
        // the thumbnail column of every map column and the thumbnail row of every map row, as the pixel's own
        // (int) (x / scale) would give them: looked up per flagged pixel instead of two divisions each
        int[] tx = new int[w];
        for (int x = 0; x < w; x++) {
            tx[x] = Math.min(tw - 1, (int) (x / scale));
        }
        int rows = (n + w - 1) / w;
        int[] ty = new int[rows];
        for (int y = 0; y < rows; y++) {
            ty[y] = Math.min(th - 1, (int) (y / scale));
        }
        for (int from = 0; from < n; from += MARK_ROWS * w) {
            markFlagged(flagged, w, tx, ty, tw, hit, from, Math.min(n, from + MARK_ROWS * w));
        }
    }

    /**
     * {@link #markFlagged(BitSet, int, double, int, int, boolean[])} for the map pixels {@code [from, to)}, from the
     * first pixel of a row; {@code tx} and {@code ty}: the thumbnail column and row of each map column and row.
     */
    private static void markFlagged(BitSet flagged, int w, int[] tx, int[] ty, int tw, boolean[] hit, int from,
                                    int to) {
        int y = from / w;
        int rowStart = y * w;
        for (int i = flagged.nextSetBit(from); i >= 0 && i < to; i = flagged.nextSetBit(i + 1)) {
            if (i - rowStart >= w) {
                y = i / w;
                rowStart = y * w;
            }
            hit[ty[y] * tw + tx[i - rowStart]] = true;
        }
    }

    /**
     * Paints the outline colour on the pixels near a flagged one ({@code near}) that are not flagged themselves;
     * {@code argb}: the pixels of the {@code TYPE_INT_ARGB} picture (no offset), {@code w} pixels a row.
     */
    private static void outline(int[] argb, boolean[] near, boolean[] hit, int w) {
        for (int from = 0; from < near.length; from += w) {
            outlineRow(argb, near, hit, from, Math.min(near.length, from + w));
        }
    }

    /** {@link #outline} for the pixels {@code [from, to)}. */
    private static void outlineRow(int[] argb, boolean[] near, boolean[] hit, int from, int to) {
        for (int i = from; i < to; i++) {
            if (near[i] && !hit[i]) {
                argb[i] = OUTLINE_ARGB;
            }
        }
    }

    /**
     * The pixels within {@code r} pixels (Chebyshev distance) of a set pixel: a square dilation, rows then columns.
     * Each row by {@link #dilateLine} (one small method with loops free of bound tests, which HotSpot compiles once;
     * the earlier single loop with its bound tests inside was compiled again after each of its deoptimisations); the
     * columns as each row of the result being the union of the row-dilated rows up to {@code r} above and below,
     * whole rows at a time ({@link #orRow}), rather than a walk down every column a row's width apart.
     */
    static boolean[] dilate(boolean[] b, int w, int h, int r) {
        boolean[] rows = new boolean[b.length];
        for (int y = 0; y < h; y++) {
            dilateLine(b, rows, y * w, w, r);
        }
        boolean[] out = new boolean[b.length];
        for (int y = 0; y < h; y++) {
            for (int yy = Math.max(0, y - r), last = Math.min(h - 1, y + r); yy <= last; yy++) {
                orRow(rows, yy * w, out, y * w, w);
            }
        }
        return out;
    }

    /** {@code dst[to..to + n) |= src[from..from + n)}. */
    private static void orRow(boolean[] src, int from, boolean[] dst, int to, int n) {
        for (int k = 0; k < n; k++) {
            dst[to + k] |= src[from + k];
        }
    }

    /**
     * Along the row of {@code n} pixels from {@code start}: {@code dst} set where a set pixel of {@code src}
     * lies within {@code r} pixels. Scanning ahead, pixel {@code at} is decided when the scan reaches
     * {@code at + r}, from the last set pixel seen.
     */
    private static void dilateLine(boolean[] src, boolean[] dst, int start, int n, int r) {
        int last = Integer.MIN_VALUE / 2; // position of the last set pixel seen
        int x = 0;
        for (; x < Math.min(r, n); x++) { // nothing decided yet
            if (src[start + x]) {
                last = x;
            }
        }
        for (x = r; x < n; x++) {
            if (src[start + x]) {
                last = x;
            }
            dst[start + x - r] = x - last <= 2 * r;
        }
        for (x = Math.max(n, r); x < n + r; x++) { // past the end: the last pixels decided
            dst[start + x - r] = x - last <= 2 * r;
        }
    }

    static void write(WaferMap map, BitSet flagged, double lowUs, double highUs, boolean caption, Path file) {
        BufferedImage img = thumbnail(map, flagged, lowUs, highUs, caption);
        Path tmp = file.resolveSibling(file.getFileName() + ".tmp");
        try {
            OutputFolder.write(file, () -> {
                try {
                    PngFiles.write(img, tmp);
                    java.nio.file.Files.move(tmp, file, java.nio.file.StandardCopyOption.REPLACE_EXISTING,
                            java.nio.file.StandardCopyOption.ATOMIC_MOVE);
                } finally {
                    java.nio.file.Files.deleteIfExists(tmp);
                }
            });
        } catch (BatchOutputException e) {
            throw new BatchOutputException.Unchecked(e); // the output folder's failure, never the wafer's
        }
    }
}
