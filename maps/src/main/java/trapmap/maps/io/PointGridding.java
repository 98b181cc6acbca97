package trapmap.maps.io;

import static trapmap.maps.io.CsvNumbers.nice;
import static trapmap.maps.io.CsvNumbers.num;

import java.util.Arrays;
import java.util.BitSet;
import java.util.List;
import java.util.Locale;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.raster.PixelGrid;

/**
 * Puts the points of a CSV point list on a raster: the pitch (given, else the most common spacing), the pixel of
 * each point on that regular grid with the centre and size the metadata give, or, for points off any such grid and
 * resampling on, an interpolation onto a grid (nearest point or inverse-distance weights within pitch·√2).
 */
final class PointGridding {
    /**
     * Least fraction of the nodes of an inferred grid that points must occupy; sparser point sets are taken as
     * scattered (a handful of points with decimal coordinates always lies on some fine grid).
     */
    static final double MIN_FILL = 0.1;

    private PointGridding() {
    }

    /**
     * The raster of the points: on their regular grid, else resampled when {@link ReadOptions#csvResampling()} is
     * on.
     *
     * @param meta     the metadata in force (comments overridden by the sidecar): pitch and centre
     * @param header   the comment lines: raster size
     * @param embedded the metadata the raw map carries
     * @param steps    the history so far; steps of gridding are added
     * @throws MapFormatException when the points are off the grid (resampling off), fall on one pixel, or exceed
     *                            the pixel limit
     */
    static MapBuilder.Raw raster(Points pts, String name, Sidecar meta, CsvHeader header, Sidecar embedded,
                                 List<ProcessingStep> steps, ReadOptions options, boolean converted)
            throws MapFormatException {
        PixelGrid grid;
        float[] samples;
        Double pitch = meta.pixelPitchMm();
        boolean pitchGiven = pitch != null;
        if (pitch == null) {
            pitch = inferPitch(pts);
            if (pitch == null) {
                pitch = options.defaultPitchMm();
                steps.add(ProcessingStep.of("assume", "note", "pixel pitch assumed: " + Sidecar.fmt(pitch) + " mm"));
            }
        }
        Placement place = place(pts, pitch, meta, header);
        double fill = place.offGrid >= 0 ? 0 : pts.n / ((double) place.width * place.height);
        boolean sparse = place.offGrid < 0 && !pitchGiven && pts.n > 1 && fill < MIN_FILL;
        if (place.offGrid >= 0 || sparse) {
            if (options.csvResampling() == ReadOptions.Resampling.OFF) {
                // no command turns resampling on: say what the user can change in the file itself
                String rule = "; the points of a CSV map must lie on a regular grid (no trapmap command resamples"
                        + " scattered points)";
                if (sparse) {
                    throw new MapFormatException(name, null, "the " + pts.n + " points do not form a regular grid:"
                            + " their most common spacing, " + num(pitch) + " mm, makes a " + place.width + " × "
                            + place.height + " grid of which only " + String.format(Locale.ROOT, "%.2g", 100 * fill)
                            + " % holds points" + rule + ": give pixel_pitch_mm in the sidecar if the pitch is not "
                            + num(pitch) + " mm");
                }
                int i = place.offGrid;
                throw new MapFormatException(name, "line " + pts.line[i], "point (" + num(pts.x[i]) + ", "
                        + num(pts.y[i]) + ") mm is not on the regular grid of pitch " + num(pitch) + " mm "
                        + (pitchGiven ? "given in the metadata" : "inferred from the most common spacing")
                        + offGrid(pts, i, pitch, meta) + rule + ": correct or remove line " + pts.line[i]
                        + (pitchGiven ? ", or correct pixel_pitch_mm" : ", or give pixel_pitch_mm in the sidecar"));
            }
            double p = Double.isNaN(options.resamplePitchMm()) ? (pitchGiven ? pitch : estimatePitch(pts, options))
                    : options.resamplePitchMm();
            return resample(pts, p, name, embedded, steps, options, converted);
        }
        long pixels = (long) place.width * place.height;
        if (pixels > options.maxPixels()) {
            throw new MapFormatException(name, null, "the points span " + place.width + " × " + place.height + " = "
                    + pixels + " pixels at pitch " + num(pitch) + " mm, more than the limit of "
                    + options.maxPixels() + " pixels (ReadOptions.maxPixels)");
        }
        samples = new float[(int) pixels];
        Arrays.fill(samples, Float.NaN);
        BitSet filled = new BitSet((int) pixels);
        for (int i = 0; i < pts.n; i++) {
            int k = place.row[i] * place.width + place.col[i];
            if (filled.get(k)) {
                int earlier = 0;
                while (place.row[earlier] * place.width + place.col[earlier] != k) {
                    earlier++;
                }
                throw new MapFormatException(name, "line " + pts.line[i], "point (" + num(pts.x[i]) + ", "
                        + num(pts.y[i]) + ") mm falls on the same pixel as the point of line " + pts.line[earlier]);
            }
            filled.set(k);
            samples[k] = pts.v[i];
        }
        grid = new PixelGrid(place.width, place.height, pitch, place.cx, place.cy);
        return new MapBuilder.Raw(samples, place.width, place.height, false, embedded, null, grid, steps,
                converted);
    }

    /**
     * Where point {@code i} lies off the grid {@link #place} lays: {@code "; its x lies between the grid columns at
     * x = 3 and 4 mm"}, for each axis it is off ("" when none is).
     */
    private static String offGrid(Points p, int i, double pitch, Sidecar meta) {
        boolean centreGiven = meta.centreXPx() != null && meta.centreYPx() != null;
        double xmin = Double.POSITIVE_INFINITY;
        double ymax = Double.NEGATIVE_INFINITY;
        for (int k = 0; k < p.n; k++) {
            xmin = Math.min(xmin, p.x[k]);
            ymax = Math.max(ymax, p.y[k]);
        }
        // grid lines: x = x0 + k·pitch, y = y0 + k·pitch (as place() counts columns and rows)
        double x0 = centreGiven ? -meta.centreXPx() * pitch : xmin;
        double y0 = centreGiven ? meta.centreYPx() * pitch : ymax;
        StringBuilder s = new StringBuilder();
        String[] axis = {"x", "y"};
        String[] lines = {"columns", "rows"};
        double[] value = {p.x[i], p.y[i]};
        double[] origin = {x0, y0};
        for (int a = 0; a < 2; a++) {
            double u = (value[a] - origin[a]) / pitch;
            if (Math.abs(u - Math.rint(u)) > 1e-6 * Math.max(1, Math.abs(value[a]) / pitch)) {
                double below = origin[a] + Math.floor(u) * pitch;
                s.append(s.length() == 0 ? "; its " : " and its ").append(axis[a]).append(" lies between the grid ")
                        .append(lines[a]).append(" at ").append(axis[a]).append(" = ").append(num(nice(below)))
                        .append(" and ").append(num(nice(below + pitch))).append(" mm");
            }
        }
        return s.toString();
    }

    /** Growable arrays of points. */
    static final class Points {
        double[] x = new double[1024];
        double[] y = new double[1024];
        float[] v = new float[1024];
        int[] line = new int[1024];
        int n;

        /** {min x, max x, min y, max y} of the points, mm. */
        double[] bounds() {
            double[] b = {Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY,
                Double.NEGATIVE_INFINITY};
            for (int i = 0; i < n; i++) {
                b[0] = Math.min(b[0], x[i]);
                b[1] = Math.max(b[1], x[i]);
                b[2] = Math.min(b[2], y[i]);
                b[3] = Math.max(b[3], y[i]);
            }
            return b;
        }

        void add(double px, double py, float pv, int l) {
            if (n == x.length) {
                int c = x.length * 2;
                x = Arrays.copyOf(x, c);
                y = Arrays.copyOf(y, c);
                v = Arrays.copyOf(v, c);
                line = Arrays.copyOf(line, c);
            }
            x[n] = px;
            y[n] = py;
            v[n] = pv;
            line[n] = l;
            n++;
        }
    }

    /** Where the points fall: pixel of each point, raster size and centre; {@code offGrid} >= 0 names a stray. */
    record Placement(int[] col, int[] row, int width, int height, double cx, double cy, int offGrid) {
    }

    static Placement place(Points p, double pitch, Sidecar meta, CsvHeader header) {
        double xmin = Double.POSITIVE_INFINITY;
        double ymax = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < p.n; i++) {
            xmin = Math.min(xmin, p.x[i]);
            ymax = Math.max(ymax, p.y[i]);
        }
        boolean centreGiven = meta.centreXPx() != null && meta.centreYPx() != null;
        double cx = centreGiven ? meta.centreXPx() : -xmin / pitch + 0.0;
        double cy = centreGiven ? meta.centreYPx() : ymax / pitch + 0.0;
        int[] col = new int[p.n];
        int[] row = new int[p.n];
        long cmin = Long.MAX_VALUE;
        long cmax = Long.MIN_VALUE;
        long rmin = Long.MAX_VALUE;
        long rmax = Long.MIN_VALUE;
        for (int i = 0; i < p.n; i++) {
            double u = centreGiven ? cx + p.x[i] / pitch : (p.x[i] - xmin) / pitch;
            double w = centreGiven ? cy - p.y[i] / pitch : (ymax - p.y[i]) / pitch;
            double ru = Math.rint(u);
            double rw = Math.rint(w);
            double tolU = 1e-6 * Math.max(1, Math.abs(p.x[i]) / pitch);
            double tolW = 1e-6 * Math.max(1, Math.abs(p.y[i]) / pitch);
            if (Math.abs(u - ru) > tolU || Math.abs(w - rw) > tolW || Math.abs(ru) > 1e9 || Math.abs(rw) > 1e9) {
                return new Placement(null, null, 0, 0, 0, 0, i);
            }
            cmin = Math.min(cmin, (long) ru);
            cmax = Math.max(cmax, (long) ru);
            rmin = Math.min(rmin, (long) rw);
            rmax = Math.max(rmax, (long) rw);
            col[i] = (int) ru;
            row[i] = (int) rw;
        }
        long width;
        long height;
        if (centreGiven && header.width() != null && header.height() != null && cmin >= 0 && rmin >= 0
                && cmax < header.width() && rmax < header.height()) {
            width = header.width();
            height = header.height();
        } else {
            for (int i = 0; i < p.n; i++) {
                col[i] -= (int) cmin;
                row[i] -= (int) rmin;
            }
            cx -= cmin;
            cy -= rmin;
            width = cmax - cmin + 1;
            height = rmax - rmin + 1;
        }
        return new Placement(col, row, (int) Math.min(width, Integer.MAX_VALUE),
                (int) Math.min(height, Integer.MAX_VALUE), cx, cy, -1);
    }

    /**
     * The most common positive spacing between distinct coordinates, the smaller of x and y; null for a single
     * point. Spacings within 10⁻⁶ (relative) count as equal; the result is rounded to the shortest decimal within
     * 10⁻⁹ (relative).
     */
    static Double inferPitch(Points p) {
        double dx = commonSpacing(Arrays.copyOf(p.x, p.n));
        double dy = commonSpacing(Arrays.copyOf(p.y, p.n));
        double d = Double.isNaN(dx) ? dy : Double.isNaN(dy) ? dx : Math.min(dx, dy);
        return Double.isNaN(d) ? null : nice(d);
    }

    private static double commonSpacing(double[] v) {
        Arrays.sort(v);
        double range = v[v.length - 1] - v[0];
        if (!(range > 0)) {
            return Double.NaN;
        }
        double[] diffs = new double[v.length];
        int n = 0;
        double last = v[0];
        for (int i = 1; i < v.length; i++) {
            double d = v[i] - last;
            if (d > 1e-6 * Math.max(Math.abs(v[i]), range)) {
                diffs[n++] = d;
                last = v[i];
            }
        }
        if (n == 0) {
            return Double.NaN;
        }
        Arrays.sort(diffs, 0, n);
        double best = diffs[0];
        int bestCount = 0;
        for (int i = 0; i < n;) {
            int j = i;
            while (j < n && diffs[j] - diffs[i] <= 1e-6 * diffs[i]) {
                j++;
            }
            if (j - i > bestCount) {
                bestCount = j - i;
                best = diffs[i + (j - i) / 2];
            }
            i = j;
        }
        return best;
    }

    static double estimatePitch(Points p, ReadOptions options) {
        double[] box = p.bounds();
        double xmin = box[0];
        double xmax = box[1];
        double ymin = box[2];
        double ymax = box[3];
        double area = (xmax - xmin) * (ymax - ymin);
        double pitch = area > 0 ? Math.sqrt(area / p.n)
                : p.n > 1 ? Math.max(xmax - xmin, ymax - ymin) / (p.n - 1) : Double.NaN;
        return pitch > 0 && Double.isFinite(pitch) ? nice(pitch) : options.defaultPitchMm();
    }

    static MapBuilder.Raw resample(Points p, double pitch, String name, Sidecar embedded,
                                           List<ProcessingStep> steps, ReadOptions options, boolean converted)
            throws MapFormatException {
        double[] box = p.bounds();
        double xmin = box[0];
        double xmax = box[1];
        double ymin = box[2];
        double ymax = box[3];
        double cols = Math.rint((xmax - xmin) / pitch) + 1;
        double rows = Math.rint((ymax - ymin) / pitch) + 1;
        if (!(cols * rows <= options.maxPixels())) {
            throw new MapFormatException(name, null, "resampling the points at pitch " + num(pitch) + " mm needs "
                    + (long) cols + " × " + (long) rows + " pixels, more than the limit of " + options.maxPixels()
                    + " pixels (ReadOptions.maxPixels)");
        }
        int w = (int) cols;
        int h = (int) rows;
        double radius = pitch * Math.sqrt(2);
        // Buckets of radius × radius: a pixel's candidates lie in the 3 × 3 buckets around its own.
        int bw = (int) Math.floor((xmax - xmin) / radius) + 1;
        int bh = (int) Math.floor((ymax - ymin) / radius) + 1;
        int[] start = new int[bw * bh + 1];
        int[] bucketOf = new int[p.n];
        for (int i = 0; i < p.n; i++) {
            int bx = Math.min(bw - 1, (int) ((p.x[i] - xmin) / radius));
            int by = Math.min(bh - 1, (int) ((p.y[i] - ymin) / radius));
            bucketOf[i] = by * bw + bx;
            start[bucketOf[i] + 1]++;
        }
        for (int b = 0; b < bw * bh; b++) {
            start[b + 1] += start[b];
        }
        int[] members = new int[p.n];
        int[] fill = Arrays.copyOf(start, start.length);
        for (int i = 0; i < p.n; i++) {
            members[fill[bucketOf[i]]++] = i;
        }
        boolean nearest = options.csvResampling() == ReadOptions.Resampling.NEAREST;
        float[] out = new float[w * h];
        double r2 = radius * radius;
        double exact = 1e-9 * pitch;
        for (int row = 0; row < h; row++) {
            double yc = ymax - row * pitch;
            int by = (int) Math.floor((yc - ymin) / radius);
            for (int col = 0; col < w; col++) {
                double xc = xmin + col * pitch;
                int bx = (int) Math.floor((xc - xmin) / radius);
                double best = Double.POSITIVE_INFINITY;
                float bestValue = Float.NaN;
                double sumW = 0;
                double sumWV = 0;
                boolean hit = false;
                for (int ny = Math.max(0, by - 1); ny <= Math.min(bh - 1, by + 1); ny++) {
                    for (int nx = Math.max(0, bx - 1); nx <= Math.min(bw - 1, bx + 1); nx++) {
                        int b = ny * bw + nx;
                        for (int k = start[b]; k < start[b + 1]; k++) {
                            int i = members[k];
                            float v = p.v[i];
                            if (v != v) {
                                continue;
                            }
                            double dx = p.x[i] - xc;
                            double dy = p.y[i] - yc;
                            double d2 = dx * dx + dy * dy;
                            if (d2 > r2) {
                                continue;
                            }
                            if (d2 < best) {
                                best = d2;
                                bestValue = v;
                            }
                            sumW += 1 / Math.max(d2, exact * exact);
                            sumWV += v / Math.max(d2, exact * exact);
                            hit = true;
                        }
                    }
                }
                out[row * w + col] = !hit ? Float.NaN : nearest || best <= exact * exact ? bestValue
                        : (float) (sumWV / sumW);
            }
        }
        steps.add(ProcessingStep.of("resample", "method", nearest ? "nearest" : "inverse-distance", "pitch_mm",
                num(pitch), "radius_mm", num(radius), "points", Integer.toString(p.n)));
        PixelGrid grid = new PixelGrid(w, h, pitch, -xmin / pitch + 0.0, ymax / pitch + 0.0);
        return new MapBuilder.Raw(out, w, h, false, embedded, null, grid, steps, converted);
    }
}
