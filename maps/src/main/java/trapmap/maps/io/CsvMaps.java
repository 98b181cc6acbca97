package trapmap.maps.io;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.BufferedReader;
import java.io.BufferedWriter;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.Reader;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.BitSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVPrinter;
import org.apache.commons.csv.CSVRecord;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.units.LifetimeUnit;

/**
 * CSV maps, read with commons-csv. Two layouts are recognised from the first line that is not a comment:
 * <ul>
 *   <li><b>Point list</b> — a header with columns {@code x_mm}, {@code y_mm} (or {@code x}, {@code y}; millimetres
 *       from the wafer centre, y upwards) and {@code value}, in any order, further columns ignored. The value column
 *       may carry the unit: {@code value_us}, {@code value(ms)}, {@code value [s]}. The points must lie on one
 *       regular square grid: the pitch is the most common positive spacing between distinct coordinates (smaller of
 *       x and y; distinct means more than 10⁻⁶ relative apart), each point must lie within 10⁻⁶ (relative) of a
 *       grid node, and grid nodes without a point are NaN. A pitch given in the comments or the sidecar is used
 *       instead of the inferred one. Points not on such a grid are refused unless {@link ReadOptions#csvResampling()}
 *       is on (see {@link ReadOptions.Resampling}); the resampled grid then has the pitch of
 *       {@link ReadOptions#resamplePitchMm()}, else the file's, else √(bounding-box area / points).</li>
 *   <li><b>Grid</b> — a plain matrix of numbers, one image row per line (first line = top row), separated by
 *       commas, semicolons (then a decimal comma is accepted), tabs or runs of spaces; an empty cell or
 *       {@code NaN} means no data.</li>
 * </ul>
 * Fields may be enclosed in double quotes, which are removed; a field cannot hold the delimiter or a line break, so
 * every record is one line (at most {@link #MAX_LINE_CHARS} characters). Comment lines start with {@code #}. Those before the first data line may carry metadata as {@code # key=value}:
 * every top-level scalar field of the sidecar schema ({@code unit}, {@code quantity}, {@code wafer_id},
 * {@code pixel_pitch_mm}, {@code centre_x_px}, ...), every field of its {@code conditions} ({@code doping=p:1e16},
 * {@code thickness_um=180}, ...), and for point lists {@code width} and {@code height} (pixels; with the centre and
 * pitch they fix the raster exactly, as trapmap writes them). A sidecar beside the file takes precedence.
 */
final class CsvMaps {
    private static final Pattern KEY_VALUE = Pattern.compile("([A-Za-z_][A-Za-z0-9_.]*)\\s*=\\s*(.*)");
    private static final Pattern VALUE_UNIT = Pattern.compile("value\\s*(?:_\\s*(.+)|[(\\[]\\s*(.+?)\\s*[)\\]])");
    /**
     * Least fraction of the nodes of an inferred grid that points must occupy; sparser point sets are taken as
     * scattered (a handful of points with decimal coordinates always lies on some fine grid).
     */
    static final double MIN_FILL = 0.1;
    private static final List<String> NUMERIC_KEYS = List.of("pixel_pitch_mm", "centre_x_px", "centre_y_px",
            "scale", "offset", "no_data");

    private CsvMaps() {
    }

    /** What the leading comment lines said. */
    private record Header(Sidecar meta, Map<String, Integer> lineOf, Long width, Long height) {
    }

    // ---------------------------------------------------------------------------------------------------- reading

    static MapBuilder.Raw read(Path file, String name, String source, Sidecar sidecar, ReadOptions options)
            throws MapFormatException {
        var decoder = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        try (BufferedReader in = new BufferedReader(new InputStreamReader(Files.newInputStream(file), decoder),
                1 << 16)) {
            List<String> comments = new ArrayList<>();
            String first = null;
            int consumed = 0;
            for (String line = readLine(in, name, 1); line != null; line = readLine(in, name, consumed + 2)) {
                consumed++;
                String t = stripBom(line, consumed).trim();
                if (t.isEmpty() || t.startsWith("#")) {
                    comments.add(t);
                    continue;
                }
                first = stripBom(line, consumed);
                break;
            }
            if (first == null) {
                throw new MapFormatException(name, null, "holds no data (only comments or empty lines)");
            }
            int offset = consumed - 1;
            Header header = header(comments, name);
            Sidecar meta = sidecar == null ? header.meta : header.meta.overriddenBy(sidecar);
            char delimiter = delimiter(first);
            boolean pointList = isHeader(split(first, delimiter), delimiter);
            Reader rest = new LineLimitReader(new ConcatReader(new StringReader(first + "\n"), in), offset);
            if (delimiter == ' ') {
                rest = new WhitespaceReader(rest);
                delimiter = '\t';
            }
            // No quote handling: a record is one line, so the line limit bounds every record (quotes are stripped
            // from single fields below).
            CSVFormat format = CSVFormat.DEFAULT.builder().setDelimiter(delimiter).setCommentMarker('#')
                    .setQuote(null).setIgnoreEmptyLines(true).setIgnoreSurroundingSpaces(true).setTrim(true).get();
            try (CSVParser parser = CSVParser.parse(rest, format)) {
                return pointList
                        ? points(parser, offset, name, source, header, meta, sidecar, options, delimiter)
                        : grid(parser, offset, name, source, header, meta, options, delimiter);
            }
        } catch (MapFormatException e) {
            throw e;
        } catch (CharacterCodingException e) {
            throw new MapFormatException(name, null, "is not UTF-8 text", "", e);
        } catch (UncheckedIOException e) {
            if (e.getCause() instanceof CharacterCodingException c) {
                throw new MapFormatException(name, null, "is not UTF-8 text", "", c);
            }
            if (e.getCause() instanceof LineTooLong t) {
                throw tooLong(name, t.line);
            }
            throw new MapFormatException(name, null, "cannot be read as CSV (" + e.getMessage() + ")", "", e);
        } catch (IOException e) {
            throw new MapFormatException(name, null, "cannot be read (" + e.getMessage() + ")", "", e);
        }
    }

    /** Longest line accepted, characters: far beyond any row of a map, small enough to hold safely. */
    static final int MAX_LINE_CHARS = 4 << 20;

    /** Signals a line beyond {@link #MAX_LINE_CHARS}. */
    private static final class LineTooLong extends IOException {
        private static final long serialVersionUID = 1L;
        final long line;

        LineTooLong(long line) {
            super("line " + line + " is longer than " + MAX_LINE_CHARS + " characters");
            this.line = line;
        }
    }

    private static MapFormatException tooLong(String name, long line) {
        return new MapFormatException(name, "line " + line, "is longer than " + MAX_LINE_CHARS + " characters; this"
                + " is not a map in CSV form");
    }

    /** The next line without its terminator, or null at the end; refuses lines beyond {@link #MAX_LINE_CHARS}. */
    private static String readLine(BufferedReader in, String name, int lineNumber) throws IOException {
        StringBuilder b = new StringBuilder();
        int c = in.read();
        if (c < 0) {
            return null;
        }
        while (c >= 0 && c != '\n' && c != '\r') {
            if (b.length() >= MAX_LINE_CHARS) {
                throw tooLong(name, lineNumber);
            }
            b.append((char) c);
            c = in.read();
        }
        if (c == '\r') {
            in.mark(1);
            if (in.read() != '\n') {
                in.reset();
            }
        }
        return b.toString();
    }

    private static String stripBom(String line, int lineNumber) {
        return lineNumber == 1 && line.startsWith("\uFEFF") ? line.substring(1) : line;
    }

    private static Header header(List<String> comments, String name) throws MapFormatException {
        ObjectNode root = Sidecar.JSON.createObjectNode();
        ObjectNode conditions = Sidecar.JSON.createObjectNode();
        Map<String, Integer> lineOf = new LinkedHashMap<>();
        Long width = null;
        Long height = null;
        List<String> warnings = new ArrayList<>();
        for (int i = 0; i < comments.size(); i++) {
            String c = comments.get(i);
            if (c.isEmpty()) {
                continue;
            }
            Matcher m = KEY_VALUE.matcher(c.substring(1).trim());
            if (!m.matches()) {
                continue; // free text
            }
            String key = m.group(1).toLowerCase(Locale.ROOT);
            String value = m.group(2).trim();
            int line = i + 1;
            if (lineOf.put(key, line) != null) {
                throw new MapFormatException(name, "line " + line, "metadata '" + key + "' is given twice");
            }
            if (key.equals("width") || key.equals("height")) {
                long v = size(value, name, line, key);
                if (key.equals("width")) {
                    width = v;
                } else {
                    height = v;
                }
            } else if (Sidecar.isConditionKey(key)) {
                putValue(conditions, key, value, !key.equals("doping"));
            } else if (Sidecar.topLevelKeys().contains(key) && !key.equals("conditions") && !key.equals("history")
                    && !key.equals("pages") && !key.equals("format")) {
                putValue(root, key, value, NUMERIC_KEYS.contains(key));
            } else {
                warnings.add("line " + line + ": comment field '" + key + "' ignored");
            }
        }
        if (!conditions.isEmpty()) {
            root.set("conditions", conditions);
        }
        Sidecar meta;
        try {
            meta = Sidecar.parse(root.toString(), name);
        } catch (MapFormatException e) {
            String field = e.location() == null ? null : e.location().replaceAll("^field '(?:conditions\\.)?(.*)'$",
                    "$1");
            Integer line = field == null ? null : lineOf.get(field);
            throw new MapFormatException(name, line == null ? e.location() : "line " + line + ", " + e.location(),
                    e.problem(), e.unit(), e);
        }
        List<String> all = new ArrayList<>(meta.warnings());
        all.addAll(warnings);
        meta = new Sidecar(meta.waferId(), meta.quantity(), meta.unit(), meta.pixelPitchMm(), meta.centreXPx(),
                meta.centreYPx(), meta.scale(), meta.offset(), meta.noData(), meta.conditions(), null, null, all);
        return new Header(meta, lineOf, width, height);
    }

    private static void putValue(ObjectNode o, String key, String value, boolean numeric) {
        if (numeric && isNumber(value)) {
            o.put(key, Double.parseDouble(value));
        } else {
            o.put(key, value);
        }
    }

    private static long size(String value, String name, int line, String key) throws MapFormatException {
        if (!value.matches("\\d{1,9}") || Long.parseLong(value) < 1) {
            throw new MapFormatException(name, "line " + line, "metadata '" + key + "' must be a whole number of"
                    + " pixels >= 1 but is '" + abbreviate(value) + "'", "px");
        }
        return Long.parseLong(value);
    }

    static char delimiter(String line) {
        if (line.indexOf(';') >= 0) {
            return ';';
        }
        if (line.indexOf(',') >= 0) {
            return ',';
        }
        if (line.indexOf('\t') >= 0) {
            return '\t';
        }
        return ' ';
    }

    private static String[] split(String line, char delimiter) {
        return delimiter == ' ' ? line.trim().split("[ \\t]+") : line.split(Pattern.quote(String.valueOf(delimiter)),
                -1);
    }

    private static boolean isHeader(String[] tokens, char delimiter) {
        for (String t : tokens) {
            String s = unquote(t.trim());
            if (!s.isEmpty() && !isNumberOrNaN(delimiter == ';' ? s.replace(',', '.') : s)) {
                return true;
            }
        }
        return false;
    }

    private static String unquote(String s) {
        return s.length() >= 2 && s.startsWith("\"") && s.endsWith("\"") ? s.substring(1, s.length() - 1) : s;
    }

    // ---------------------------------------------------------------------------------------------- point lists

    private static MapBuilder.Raw points(CSVParser parser, int offset, String name, String source, Header header,
                                         Sidecar meta, Sidecar sidecar, ReadOptions options, char delimiter)
            throws MapFormatException {
        int ix = -1;
        int iy = -1;
        int iv = -1;
        String columnUnit = null;
        double factor = 1;
        Points pts = new Points();
        int headerLine = offset + 1;
        boolean first = true;
        try {
            for (CSVRecord r : parser) {
                int line = offset + (int) parser.getCurrentLineNumber();
                if (first) {
                    first = false;
                    headerLine = line;
                    for (int i = 0; i < r.size(); i++) {
                        String h = unquote(r.get(i).trim()).toLowerCase(Locale.ROOT);
                        if (h.equals("x_mm") || h.equals("x")) {
                            ix = column(ix, i, h, name, line);
                        } else if (h.equals("y_mm") || h.equals("y")) {
                            iy = column(iy, i, h, name, line);
                        } else if (h.equals("value")) {
                            iv = column(iv, i, h, name, line);
                        } else {
                            Matcher m = VALUE_UNIT.matcher(h);
                            if (m.matches()) {
                                iv = column(iv, i, h, name, line);
                                columnUnit = m.group(1) != null ? m.group(1).trim() : m.group(2).trim();
                            }
                        }
                    }
                    if (ix < 0 || iy < 0 || iv < 0) {
                        String missing = ix < 0 ? "x_mm (or x)" : iy < 0 ? "y_mm (or y)" : "value";
                        throw new MapFormatException(name, "line " + line, "the header '" + abbreviate(
                                String.join(String.valueOf(delimiter), r.toList())) + "' has no column " + missing
                                + "; a point list needs x_mm, y_mm and value");
                    }
                    factor = lifetimeFactor(meta, columnUnit);
                    continue;
                }
                int needed = Math.max(ix, Math.max(iy, iv)) + 1;
                if (r.size() < needed) {
                    throw new MapFormatException(name, "line " + line, "has " + r.size() + " field"
                            + (r.size() == 1 ? "" : "s") + "; the header needs " + needed);
                }
                if (pts.n >= options.maxPixels()) {
                    throw new MapFormatException(name, "line " + line, "more than " + options.maxPixels()
                            + " points, the pixel limit (ReadOptions.maxPixels)");
                }
                double x = coordinate(r.get(ix), name, line, "x_mm", delimiter);
                double y = coordinate(r.get(iy), name, line, "y_mm", delimiter);
                float v = value(r.get(iv), name, line, unitForMessages(meta, columnUnit), delimiter, factor);
                pts.add(x, y, v, line);
            }
        } catch (UncheckedIOException | IllegalStateException e) {
            throw malformed(e, parser, offset, name);
        }
        if (pts.n == 0) {
            throw new MapFormatException(name, "line " + headerLine, "the header is followed by no points");
        }
        if (columnUnit != null) {
            String commentUnit = header.meta.unit();
            if (commentUnit != null && !Sidecar.normaliseUnit(commentUnit).equals(Sidecar.normaliseUnit(columnUnit))) {
                Integer l = header.lineOf.get("unit");
                throw new MapFormatException(name, "line " + headerLine, "the value column says unit '" + columnUnit
                        + "' but line " + l + " says unit '" + commentUnit + "'");
            }
        }
        Sidecar embedded = header.meta;
        if (columnUnit != null && embedded.unit() == null) {
            embedded = new Sidecar(embedded.waferId(), embedded.quantity(), columnUnit, embedded.pixelPitchMm(),
                    embedded.centreXPx(), embedded.centreYPx(), embedded.scale(), embedded.offset(),
                    embedded.noData(), embedded.conditions(), null, null, embedded.warnings());
        }
        List<ProcessingStep> steps = new ArrayList<>();
        steps.add(ProcessingStep.of("read", "file", source, "format", "csv point list", "points",
                Integer.toString(pts.n)));
        boolean converted = factor != 1;
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
                String advice = "; the points look scattered — read them with CSV resampling on (ReadOptions"
                        + ".withCsvResampling) to interpolate them onto a grid, or give pixel_pitch_mm";
                if (sparse) {
                    throw new MapFormatException(name, null, "the " + pts.n + " points do not form a regular grid:"
                            + " their most common spacing, " + num(pitch) + " mm, makes a " + place.width + " × "
                            + place.height + " grid of which only " + String.format(Locale.ROOT, "%.2g", 100 * fill)
                            + " % holds points" + advice);
                }
                int i = place.offGrid;
                throw new MapFormatException(name, "line " + pts.line[i], "point (" + num(pts.x[i]) + ", "
                        + num(pts.y[i]) + ") mm is not on the regular grid of pitch " + num(pitch) + " mm "
                        + (pitchGiven ? "given in the metadata" : "inferred from the most common spacing")
                        + advice);
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

    /** The unit values are taken in: as given, else the quantity's, else µs (what the reader will assume). */
    private static String unitForMessages(Sidecar meta, String columnUnit) {
        return meta.unit() != null ? meta.unit() : columnUnit != null ? columnUnit
                : meta.quantity() != null ? meta.quantity().unit() : "µs";
    }

    private static int column(int current, int index, String header, String name, int line)
            throws MapFormatException {
        if (current >= 0) {
            throw new MapFormatException(name, "line " + line, "the header has two columns for '" + header + "'");
        }
        return index;
    }

    /** Growable arrays of points. */
    private static final class Points {
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
    private record Placement(int[] col, int[] row, int width, int height, double cx, double cy, int offGrid) {
    }

    private static Placement place(Points p, double pitch, Sidecar meta, Header header) {
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
        if (centreGiven && header.width != null && header.height != null && cmin >= 0 && rmin >= 0
                && cmax < header.width && rmax < header.height) {
            width = header.width;
            height = header.height;
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

    /** The shortest decimal within 10⁻⁹ (relative) of {@code v}. */
    static double nice(double v) {
        for (int digits = 1; digits <= 17; digits++) {
            double r = Double.parseDouble(String.format(Locale.ROOT, "%." + (digits - 1) + "e", v));
            if (Math.abs(r - v) <= 1e-9 * Math.abs(v)) {
                return r;
            }
        }
        return v;
    }

    private static double estimatePitch(Points p, ReadOptions options) {
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

    private static MapBuilder.Raw resample(Points p, double pitch, String name, Sidecar embedded,
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

    // ---------------------------------------------------------------------------------------------------- grids

    private static MapBuilder.Raw grid(CSVParser parser, int offset, String name, String source, Header header,
                                       Sidecar meta, ReadOptions options, char delimiter)
            throws MapFormatException {
        float[] s = new float[1024];
        int n = 0;
        int width = -1;
        int rows = 0;
        boolean trailing = false;
        int firstLine = offset + 1;
        String unit = unitForMessages(meta, null);
        double factor = lifetimeFactor(meta, null);
        try {
            for (CSVRecord r : parser) {
                int line = offset + (int) parser.getCurrentLineNumber();
                int size = r.size();
                if (width < 0) {
                    firstLine = line;
                    trailing = size > 1 && r.get(size - 1).isEmpty() && delimiter != '\t';
                    width = trailing ? size - 1 : size;
                }
                if (trailing && size == width + 1 && r.get(size - 1).isEmpty()) {
                    size--;
                }
                if (size != width) {
                    throw new MapFormatException(name, "line " + line, "has " + size + " value" + (size == 1 ? ""
                            : "s") + " but line " + firstLine + " has " + width + "; every row of a grid needs the"
                            + " same number");
                }
                if ((long) (rows + 1) * width > options.maxPixels()) {
                    throw new MapFormatException(name, "line " + line, "the grid exceeds the limit of "
                            + options.maxPixels() + " pixels (ReadOptions.maxPixels)");
                }
                if (n + width > s.length) {
                    s = Arrays.copyOf(s, (int) Math.min(ReadOptions.MAX_PIXELS_LIMIT,
                            Math.max((long) s.length * 2, (long) n + width)));
                }
                for (int i = 0; i < width; i++) {
                    s[n++] = value(r.get(i), name, line, unit, delimiter, factor);
                }
                rows++;
            }
        } catch (UncheckedIOException | IllegalStateException e) {
            throw malformed(e, parser, offset, name);
        }
        if (rows == 0) {
            throw new MapFormatException(name, null, "holds no data");
        }
        List<ProcessingStep> steps = new ArrayList<>();
        steps.add(ProcessingStep.of("read", "file", source, "format", "csv grid", "size", width + "x" + rows));
        return new MapBuilder.Raw(Arrays.copyOf(s, n), width, rows, false, header.meta, null, null, steps,
                factor != 1);
    }

    private static MapFormatException malformed(RuntimeException e, CSVParser parser, int offset, String name) {
        Throwable cause = e.getCause() != null ? e.getCause() : e;
        if (cause instanceof CharacterCodingException) {
            return new MapFormatException(name, null, "is not UTF-8 text", "", e);
        }
        if (cause instanceof LineTooLong t) {
            return tooLong(name, t.line);
        }
        String m = cause.getMessage() == null ? cause.getClass().getSimpleName() : cause.getMessage();
        return new MapFormatException(name, "line " + (offset + parser.getCurrentLineNumber() + 1),
                "malformed CSV (" + abbreviate(MapFormatException.oneLine(m)) + ")", "", e);
    }

    // ---------------------------------------------------------------------------------------------------- numbers

    private static double coordinate(String text, String name, int line, String column, char delimiter)
            throws MapFormatException {
        String t = number(text, delimiter);
        if (!isNumber(t)) {
            throw new MapFormatException(name, "line " + line, column + " '" + abbreviate(text) + "' is not a"
                    + " number", "mm");
        }
        double v = Double.parseDouble(t);
        if (!(Math.abs(v) <= 1e6)) {
            throw new MapFormatException(name, "line " + line, column + " '" + abbreviate(text) + "' is outside"
                    + " [-1e6, 1e6]", "mm");
        }
        return v;
    }

    /**
     * The factor that takes the values to µs when they are lifetimes in another unit (applied while parsing, to the
     * decimal text, so that 0.001 s gives exactly 1000 µs), else 1. Undecidable units are left to {@link MapBuilder}.
     */
    private static double lifetimeFactor(Sidecar meta, String columnUnit) {
        String unit = meta.unit() != null ? meta.unit() : columnUnit;
        if (unit == null || (meta.quantity() != null && !MapBuilder.isLifetime(meta.quantity()))) {
            return 1;
        }
        try {
            return LifetimeUnit.parse(unit).toMicroseconds(1);
        } catch (IllegalArgumentException e) {
            return 1;
        }
    }

    private static float value(String text, String name, int line, String unit, char delimiter, double factor)
            throws MapFormatException {
        String t = number(text, delimiter);
        if (t.isEmpty() || isNaN(t)) {
            return Float.NaN;
        }
        if (!isNumber(t)) {
            throw new MapFormatException(name, "line " + line, "value '" + abbreviate(text) + "' is not a number",
                    unitLabel(unit));
        }
        float v = factor == 1 ? Float.parseFloat(t) : (float) (Double.parseDouble(t) * factor);
        if (Float.isInfinite(v)) {
            throw new MapFormatException(name, "line " + line, "value '" + abbreviate(text) + "' is beyond the"
                    + " 32-bit float range", unitLabel(unit));
        }
        return v;
    }

    private static String unitLabel(String unit) {
        String u = unit == null ? "" : unit.trim();
        return Sidecar.normaliseUnit(u).equals("us") ? "µs" : u;
    }

    private static String number(String text, char delimiter) {
        String t = unquote(text.trim());
        return delimiter == ';' && t.indexOf(',') >= 0 && t.indexOf('.') < 0 ? t.replace(',', '.') : t;
    }

    private static boolean isNaN(String t) {
        return t.equalsIgnoreCase("nan") || t.equalsIgnoreCase("-nan") || t.equalsIgnoreCase("+nan");
    }

    private static boolean isNumberOrNaN(String t) {
        return isNumber(t) || isNaN(t);
    }

    /** A decimal number: optional sign, digits with an optional point, optional exponent; nothing else. */
    static boolean isNumber(String t) {
        int n = t.length();
        int i = 0;
        if (i < n && (t.charAt(i) == '+' || t.charAt(i) == '-')) {
            i++;
        }
        int digits = 0;
        while (i < n && t.charAt(i) >= '0' && t.charAt(i) <= '9') {
            i++;
            digits++;
        }
        if (i < n && t.charAt(i) == '.') {
            i++;
            while (i < n && t.charAt(i) >= '0' && t.charAt(i) <= '9') {
                i++;
                digits++;
            }
        }
        if (digits == 0) {
            return false;
        }
        if (i < n && (t.charAt(i) == 'e' || t.charAt(i) == 'E')) {
            i++;
            if (i < n && (t.charAt(i) == '+' || t.charAt(i) == '-')) {
                i++;
            }
            int exp = 0;
            while (i < n && t.charAt(i) >= '0' && t.charAt(i) <= '9') {
                i++;
                exp++;
            }
            if (exp == 0) {
                return false;
            }
        }
        return i == n;
    }

    private static String num(double v) {
        return Sidecar.fmt(nice(v));
    }

    private static String abbreviate(String s) {
        return s.length() <= 40 ? s : s.substring(0, 37) + "...";
    }

    // ---------------------------------------------------------------------------------------------------- writing

    /**
     * Writes a point list {@code x_mm,y_mm,value} (no-data pixels left out) under comment lines giving wafer id,
     * quantity, unit, pitch, centre, raster size and conditions, so that the file reads back onto the same grid.
     */
    static void write(WaferMap map, Path target) throws IOException {
        List<String> comments = new ArrayList<>();
        comments.add("trapmap map");
        comments.add("wafer_id=" + map.waferId().replaceAll("\\R", " "));
        comments.add("quantity=" + map.quantity().key());
        comments.add("unit=" + Sidecar.asciiUnit(map.quantity().unit()));
        PixelGrid g = map.grid();
        comments.add("pixel_pitch_mm=" + g.pitchMm());
        comments.add("centre_x_px=" + g.centreXPx());
        comments.add("centre_y_px=" + g.centreYPx());
        comments.add("width=" + map.width());
        comments.add("height=" + map.height());
        MeasurementConditions c = map.conditions();
        Sidecar.conditionsJson(c).properties().forEach(e -> {
            if (!e.getKey().equals("extra")) {
                comments.add(e.getKey() + "=" + e.getValue().asText());
            }
        });
        CSVFormat format = CSVFormat.DEFAULT.builder().setCommentMarker('#').setRecordSeparator('\n')
                .setHeaderComments(comments.toArray(new Object[0])).setHeader("x_mm", "y_mm", "value").get();
        float[] s = map.raster().samples();
        int w = map.width();
        try (Writer out = new BufferedWriter(Files.newBufferedWriter(target, StandardCharsets.UTF_8), 1 << 16);
             CSVPrinter printer = new CSVPrinter(out, format)) {
            for (int y = 0; y < map.height(); y++) {
                String yMm = Double.toString(g.yMm(y));
                for (int x = 0; x < w; x++) {
                    float v = s[y * w + x];
                    if (v == v) {
                        printer.printRecord(Double.toString(g.xMm(x)), yMm, Float.toString(v));
                    }
                }
            }
        }
    }

    // ---------------------------------------------------------------------------------------------------- readers

    /** One reader after another. */
    private static final class ConcatReader extends Reader {
        private final Reader first;
        private final Reader second;
        private boolean firstDone;

        ConcatReader(Reader first, Reader second) {
            this.first = first;
            this.second = second;
        }

        @Override
        public int read(char[] buf, int off, int len) throws IOException {
            if (!firstDone) {
                int r = first.read(buf, off, len);
                if (r >= 0) {
                    return r;
                }
                firstDone = true;
            }
            return second.read(buf, off, len);
        }

        @Override
        public void close() throws IOException {
            first.close();
            second.close();
        }
    }

    /** Refuses lines longer than {@link #MAX_LINE_CHARS}, counting lines after {@code offset} earlier ones. */
    private static final class LineLimitReader extends Reader {
        private final Reader in;
        private long line;
        private int length;
        private boolean afterCr;

        LineLimitReader(Reader in, int offset) {
            this.in = in;
            this.line = offset + 1;
        }

        @Override
        public int read(char[] buf, int off, int len) throws IOException {
            int n = in.read(buf, off, len);
            for (int i = off; i < off + Math.max(n, 0); i++) {
                char c = buf[i];
                if (c == '\r' || (c == '\n' && !afterCr)) {
                    line++;
                    length = 0;
                } else if (c != '\n' && ++length > MAX_LINE_CHARS) {
                    throw new LineTooLong(line);
                }
                afterCr = c == '\r';
            }
            return n;
        }

        @Override
        public void close() throws IOException {
            in.close();
        }
    }

    /** Turns each run of spaces and tabs into one tab, dropping runs at the start and end of lines. */
    private static final class WhitespaceReader extends Reader {
        private final Reader in;
        private boolean gap;
        private boolean lineStart = true;
        private int pending = -1;

        WhitespaceReader(Reader in) {
            this.in = new BufferedReader(in, 1 << 16);
        }

        private int next() throws IOException {
            if (pending >= 0) {
                int c = pending;
                pending = -1;
                return c;
            }
            while (true) {
                int c = in.read();
                if (c == ' ' || c == '\t') {
                    gap = !lineStart;
                    continue;
                }
                if (c < 0 || c == '\n' || c == '\r') {
                    gap = false;
                    lineStart = true;
                    return c;
                }
                lineStart = false;
                if (gap) {
                    gap = false;
                    pending = c;
                    return '\t';
                }
                return c;
            }
        }

        @Override
        public int read(char[] buf, int off, int len) throws IOException {
            int i = 0;
            while (i < len) {
                int c = next();
                if (c < 0) {
                    return i == 0 ? -1 : i;
                }
                buf[off + i++] = (char) c;
            }
            return i;
        }

        @Override
        public void close() throws IOException {
            in.close();
        }
    }
}
