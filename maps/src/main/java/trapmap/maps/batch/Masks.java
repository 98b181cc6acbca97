package trapmap.maps.batch;

import trapmap.maps.geometry.WaferShape;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/**
 * The evaluated pixels (valid and at least the edge exclusion inside the outline) as ascending indices
 * ({@code indices[0..count)}), and, when asked for, the centre pixels of {@code edge_to_centre_ratio} (null
 * otherwise); {@code missing} counts the NaN pixels inside the outline less the edge exclusion (no data where the
 * wafer is: 0 without an outline, where they cannot be told from the background), for
 * {@code invalid_area_fraction}. The batch reads the indices only; the evaluated pixels as per-pixel flags are made
 * from them when asked for ({@link #evaluated()}).
 */
final class Masks {
    private final int[] indices;
    private final int count;
    private final boolean[] centre;
    private final int missing;
    private final int pixels;
    private boolean[] evaluated;

    /**
     * @param pixels the map's number of pixels
     */
    Masks(int[] indices, int count, boolean[] centre, int missing, int pixels) {
        this.indices = indices;
        this.count = count;
        this.centre = centre;
        this.missing = missing;
        this.pixels = pixels;
    }

    /** The evaluated pixels' indices, ascending, in {@code [0, count())}; the array may be longer. */
    int[] indices() {
        return indices;
    }

    /** The number of evaluated pixels. */
    int count() {
        return count;
    }

    /** The centre pixels of {@code edge_to_centre_ratio} as per-pixel flags, or null when none were asked for. */
    boolean[] centre() {
        return centre;
    }

    /** NaN pixels inside the outline less the edge exclusion, left out of the evaluated ones. */
    int missing() {
        return missing;
    }

    /** The evaluated pixels as per-pixel flags (made on the first call, then the same array). */
    boolean[] evaluated() {
        if (evaluated == null) {
            boolean[] in = new boolean[pixels];
            for (int k = 0; k < count; k++) {
                in[indices[k]] = true;
            }
            evaluated = in;
        }
        return evaluated;
    }

    /**
     * The masks of {@link Masks}: the evaluated pixels are exactly those of
     * {@code Mask.valid(raster).and(shape.mask(grid, exclusionMm))}, {@code centre} those at least {@code centreMm}
     * inside (NaN: none asked for). The distance to the outline changes by at most the distance moved (it is
     * 1-Lipschitz), so after one exact distance d the next pixels of the row up to |d − e| away lie on the same side
     * of every threshold e and are filled without being computed; only pixels near a threshold are computed one by
     * one.
     */
    static Masks of(float[] tau, PixelGrid grid, WaferShape shape, double exclusionMm, double centreMm) {
        return of(tau, grid, shape, exclusionMm, centreMm, new InspectionBuffers(), null);
    }

    /**
     * As {@link #of(float[], PixelGrid, WaferShape, double, double)} into the index array of {@code buffers}, and in
     * the same pass the evaluated samples packed in index order into {@code packed[0..count)} when it is not null
     * (the gather of {@link Sample#gather}).
     */
    static Masks of(float[] tau, PixelGrid grid, WaferShape shape, double exclusionMm, double centreMm,
                    InspectionBuffers buffers, float[] packed) {
        int w = grid.width();
        int h = grid.height();
        boolean[] centre = Double.isNaN(centreMm) ? null : new boolean[w * h];
        int[] indices = buffers.indices(w * h);
        if (shape == null) {
            return new Masks(indices, valid(tau, 0, w * h, indices, 0, packed), centre, 0, w * h);
        }
        // one row per call of a small method: the just-in-time compiler compiles it once for all maps (loops over
        // the whole map in this method, which runs once per map, would be compiled on the stack, each loop with
        // all the others)
        RowScan scan = new RowScan(tau, grid, shape, exclusionMm, centreMm, centre, indices, packed);
        for (int y = 0; y < h; y++) {
            scan.row(y);
        }
        return new Masks(indices, scan.count, centre, scan.missing, w * h);
    }

    /**
     * Adds the pixels of {@code tau[from..to)} that are not NaN to {@code indices} (and their values to
     * {@code packed} when it is not null) from position {@code count}; returns the new count.
     */
    private static int valid(float[] tau, int from, int to, int[] indices, int count, float[] packed) {
        for (int i = from; i < to; i++) {
            float v = tau[i];
            if (v == v) {
                if (packed != null) {
                    packed[count] = v;
                }
                indices[count++] = i;
            }
        }
        return count;
    }

    /**
     * The evaluated pixels of a map with an outline, one row at a time ({@link #row}), in index order: their
     * indices, values and centre flags, and the NaN pixels inside the exclusion ({@code missing}).
     */
    private static final class RowScan {
        private final float[] tau;
        private final PixelGrid grid;
        private final WaferShape.Prepared p;
        private final double exclusionMm;
        private final double centreMm;
        private final double pitch;
        private final double cx;
        private final double cy;
        private final boolean[] centre;
        private final int[] indices;
        private final float[] packed;
        private final int w;
        int count;
        int missing;

        RowScan(float[] tau, PixelGrid grid, WaferShape shape, double exclusionMm, double centreMm, boolean[] centre,
                int[] indices, float[] packed) {
            this.tau = tau;
            this.grid = grid;
            this.p = shape.prepared();
            this.exclusionMm = exclusionMm;
            this.centreMm = centreMm;
            this.pitch = grid.pitchMm();
            this.cx = shape.centreXMm();
            this.cy = shape.centreYMm();
            this.centre = centre;
            this.indices = indices;
            this.packed = packed;
            this.w = grid.width();
        }

        /** Scans row y (rows in ascending order). */
        void row(int y) {
            boolean[] centre = this.centre;
            boolean pack = packed != null;
            int count = this.count;
            int missing = this.missing;
            double ym = grid.yMm(y);
            int row = y * w;
            int x = 0;
            while (x < w) {
                // the near distance decides, except within its error bound of a threshold: there the exact one does
                double xm = grid.xMm(x);
                double error = p.nearDistanceErrorMm(Math.abs(xm - cx) + Math.abs(ym - cy));
                double d = p.nearDistanceToEdgeMm(xm, ym);
                if (Math.abs(d - exclusionMm) <= error || centre != null && Math.abs(d - centreMm) <= error) {
                    d = p.distanceToEdgeMm(xm, ym);
                    error = 0;
                }
                double slack = 1e-7 + error; // mm, far above the rounding of the distance and coordinates
                boolean inside = d >= exclusionMm;
                boolean central = centre != null && d >= centreMm;
                double margin = Math.abs(d - exclusionMm);
                if (centre != null) {
                    margin = Math.min(margin, Math.abs(d - centreMm));
                }
                int run = margin > slack ? 1 + (int) Math.min(w, Math.floor((margin - slack) / pitch)) : 1;
                int end = Math.min(w, x + run);
                if (!inside) {
                    x = end;
                    continue;
                }
                // the stretches without NaN between the NaN pixels (most runs have none), each copied at once
                int i = row + x;
                int stop = row + end;
                while (i < stop) {
                    int j = pack ? packUntilNaN(tau, i, stop, packed, indices, count) : validUntil(tau, i, stop);
                    int len = j - i;
                    if (!pack) {
                        ascending(indices, count, i, len);
                    }
                    if (central) {
                        java.util.Arrays.fill(centre, i, j, true);
                    }
                    count += len;
                    if (j < stop) { // a NaN pixel
                        missing++;
                        j++;
                    }
                    i = j;
                }
                x = end;
            }
            this.count = count;
            this.missing = missing;
        }
    }

    // The loops over the pixels of a run are small methods of their own, so that the loop over a row's runs above
    // turns only a few times a call: the just-in-time compiler then compiles each method once (not the row's method
    // on the stack for each of its inner loops).

    /** The first index in [from, to) whose value is NaN, or {@code to}. */
    private static int validUntil(float[] tau, int from, int to) {
        int j = from;
        while (j < to && tau[j] == tau[j]) {
            j++;
        }
        return j;
    }

    /**
     * {@link #validUntil} that on its way copies the values before the first NaN into {@code packed} and their
     * indices into {@code indices}, both from position {@code at}: one pass over the values instead of three (the
     * search, the copy and the indices).
     */
    private static int packUntilNaN(float[] tau, int from, int to, float[] packed, int[] indices, int at) {
        int shift = at - from;
        int j = from;
        while (j < to) {
            float v = tau[j];
            if (v != v) {
                break;
            }
            packed[j + shift] = v;
            indices[j + shift] = j;
            j++;
        }
        return j;
    }

    /** Writes first, first + 1, … (len of them) into {@code indices} from position {@code at}. */
    private static void ascending(int[] indices, int at, int first, int len) {
        for (int t = 0; t < len; t++) {
            indices[at + t] = first + t;
        }
    }

    /** A Mask of the same pixels as a boolean array. */
    static Mask mask(boolean[] in, PixelGrid grid) {
        return Mask.of(grid.width(), grid.height(), i -> in[i]);
    }

    /**
     * Harmonic-mean lifetime of the evaluated pixels outside the centre over that of those inside, each over the
     * positive lifetimes in index order (as {@link MapStatistics#harmonicMean()} sums them).
     */
    static double edgeToCentre(float[] tau, Masks masks) {
        double edgeSum = 0;
        double centreSum = 0;
        int edgeCount = 0;
        int centreCount = 0;
        int[] idx = masks.indices();
        boolean[] centre = masks.centre();
        for (int k = 0, n = masks.count(); k < n; k++) {
            int i = idx[k];
            double v = tau[i];
            if (v > 0) {
                if (centre[i]) {
                    centreSum += 1 / v;
                    centreCount++;
                } else {
                    edgeSum += 1 / v;
                    edgeCount++;
                }
            }
        }
        double e = edgeCount == 0 ? Double.NaN : edgeCount / edgeSum;
        double c = centreCount == 0 ? Double.NaN : centreCount / centreSum;
        return e / c;
    }
}
