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
        float[] s = map.raster().samples();
        float[] small = new float[tw * th];
        boolean[] hit = new boolean[tw * th];
        for (int ty = 0; ty < th; ty++) {
            for (int tx = 0; tx < tw; tx++) {
                int i = sy[ty] * w + sx[tx];
                small[ty * tw + tx] = s[i];
                hit[ty * tw + tx] = flagged.get(i);
            }
        }
        for (int i = flagged.nextSetBit(0); i >= 0; i = flagged.nextSetBit(i + 1)) {
            int tx = Math.min(tw - 1, (int) ((i % w) / scale));
            int ty = Math.min(th - 1, (int) ((i / w) / scale));
            hit[ty * tw + tx] = true;
        }
        PixelGrid g = map.grid();
        PixelGrid sg = new PixelGrid(tw, th, g.pitchMm() * scale, (g.centreXPx() + 0.5) / scale - 0.5,
                (g.centreYPx() + 0.5) / scale - 0.5);
        PngStyle style = PngStyle.DEFAULT;
        if (lowUs > 0 && highUs > lowUs) {
            style = style.withRange(lowUs, highUs);
        }
        BufferedImage out = MapFiles.picture(new WaferMap(FloatRaster.wrap(tw, th, small), sg, map.quantity(),
                map.waferId(), map.conditions(), map.provenance()), style);
        boolean[] near = dilate(hit, tw, th, OUTLINE_PX);
        int[] argb = ((DataBufferInt) out.getRaster().getDataBuffer()).getData(); // TYPE_INT_ARGB, no offset
        for (int i = 0; i < near.length; i++) {
            if (near[i] && !hit[i]) {
                argb[i] = OUTLINE_ARGB;
            }
        }
        return out;
    }

    /** The pixels within {@code r} pixels (Chebyshev distance) of a set pixel: a square dilation, rows then columns. */
    static boolean[] dilate(boolean[] b, int w, int h, int r) {
        boolean[] rows = new boolean[b.length];
        for (int y = 0; y < h; y++) {
            int row = y * w;
            int last = Integer.MIN_VALUE / 2; // x of the last set pixel seen, scanning right
            for (int x = 0; x < w + r; x++) {
                if (x < w && b[row + x]) {
                    last = x;
                }
                int at = x - r; // pixel whose window [at - r, at + r] ends at x
                if (at >= 0 && at < w) {
                    rows[row + at] = x - last <= 2 * r;
                }
            }
        }
        boolean[] out = new boolean[b.length];
        for (int x = 0; x < w; x++) {
            int last = Integer.MIN_VALUE / 2;
            for (int y = 0; y < h + r; y++) {
                if (y < h && rows[y * w + x]) {
                    last = y;
                }
                int at = y - r;
                if (at >= 0 && at < h) {
                    out[at * w + x] = y - last <= 2 * r;
                }
            }
        }
        return out;
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
