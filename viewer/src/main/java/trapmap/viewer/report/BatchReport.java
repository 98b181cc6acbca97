package trapmap.viewer.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.Ellipse2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.ZonedDateTime;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Stream;
import javax.imageio.ImageIO;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYBarRenderer;
import org.jfree.data.xy.XYIntervalSeries;
import org.jfree.data.xy.XYIntervalSeriesCollection;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.Figure;
import trapmap.maps.batch.Rules;
import trapmap.maps.io.ColourMap;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.WaferMap;
import trapmap.maps.region.Region;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.RegionTable;
import trapmap.maps.region.ThresholdRegions;
import trapmap.viewer.graphics.ChartExport;
import trapmap.viewer.graphics.ChartStyle;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.graphics.Labels;

/**
 * The summary PDF of a batch inspection, made from what the batch wrote into its output folder ({@code results.csv},
 * {@code recurrence-*.tif}, {@code thumbnails/}), so that it also covers rows kept from a resumed run:
 * <ol>
 *   <li>page 1: yield (pass, fail and error counts and shares), grade counts, and the distribution of every
 *       figure over the wafers with the rules' limits marked;</li>
 *   <li>the worst wafers (most failed rules, then the largest flagged area fraction) with their thumbnails, or their
 *       maps with the largest flagged region circled, and their figures;</li>
 *   <li>the recurrence map of each wafer family with its hot spots: positions flagged on more than
 *       {@link Content#hotSpotFraction()} of the wafers;</li>
 *   <li>the files that could not be inspected, with their reasons; and the caution.</li>
 * </ol>
 * Works headless; pictures are embedded at 2×.
 */
public final class BatchReport {
    /** The file name in the batch's output folder. */
    public static final String FILE_NAME = "summary.pdf";
    /** Default share of the wafers above which a recurrence cell is a hot spot: one in four (this program's choice). */
    public static final double DEFAULT_HOT_SPOT_FRACTION = 0.25;
    /** Worst wafers shown. */
    public static final int WORST_WAFERS = 6;
    private static final double SCALE = 2;
    private static final DateTimeFormatter DATE = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm z", Locale.ROOT);
    private static final Color PASS = new Color(0x2E7D32);
    private static final Color FAIL = new Color(0xC62828);

    /**
     * One row of {@code results.csv}.
     *
     * @param file          the map file as given to the batch
     * @param waferId       wafer id ("" when it could not be read)
     * @param status        pass, fail or error
     * @param grade         grade ("" for none)
     * @param figures       figure name → value (NaN when empty), in the results' column order
     * @param failed        figures outside their limits
     * @param worstAreaMm2  area of the largest flagged region, mm² (NaN: none)
     * @param worstXMm      its centroid x in wafer coordinates, mm
     * @param worstYMm      its centroid y, mm
     * @param worstPeak     its peak value in the flag's unit
     * @param error         the reason of an error row
     */
    public record Row(String file, String waferId, String status, String grade, Map<String, Double> figures,
                      List<String> failed, double worstAreaMm2, double worstXMm, double worstYMm, double worstPeak,
                      String error) {
        public Row {
            figures = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(figures));
            failed = List.copyOf(failed);
        }

        /** The wafer id, or the file name when there is none. */
        public String name() {
            return waferId.isEmpty() ? Path.of(file).getFileName().toString() : waferId;
        }

        double figure(String name) {
            return figures.getOrDefault(name, Double.NaN);
        }
    }

    /**
     * What the summary shows.
     *
     * @param outputDir       the batch's output folder (thumbnails are looked up in it)
     * @param rules           the rules of the batch (limits, flag), null when unknown
     * @param rows            the results, in the results' order
     * @param recurrence      family → recurrence map (fraction of wafers flagged per cell)
     * @param created         the date printed
     * @param hotSpotFraction share of the wafers above which a recurrence cell is a hot spot, in (0, 1)
     */
    public record Content(Path outputDir, Rules rules, List<Row> rows, Map<String, WaferMap> recurrence,
                          ZonedDateTime created, double hotSpotFraction) {
        public Content {
            rows = List.copyOf(rows);
            recurrence = java.util.Collections.unmodifiableMap(new TreeMap<>(recurrence));
            created = created == null ? ZonedDateTime.now() : created;
            if (!(hotSpotFraction > 0 && hotSpotFraction < 1)) {
                throw new IllegalArgumentException("hot-spot fraction must be in (0, 1) but was " + hotSpotFraction);
            }
        }

        long count(String status) {
            return rows.stream().filter(r -> r.status().equals(status)).count();
        }
    }

    private BatchReport() {
    }

    /** Reads the results of a finished batch from its output folder. */
    public static Content read(Path outputDir, Rules rules) throws IOException {
        Path csv = outputDir.resolve(BatchInspection.CSV_NAME);
        List<Row> rows = new ArrayList<>();
        try (Reader r = Files.newBufferedReader(csv, StandardCharsets.UTF_8);
             CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r)) {
            List<String> header = p.getHeaderNames();
            // figure columns: between the last identifying column (grade, profile, defect) and failed_rules
            int from = Math.max(header.indexOf("grade"), Math.max(header.indexOf("profile"),
                    header.indexOf("defect"))) + 1;
            int to = header.indexOf("failed_rules");
            if (from <= 0 || to < from) {
                throw new IOException(csv + ": not a results table (columns grade … failed_rules missing)");
            }
            List<String> figureColumns = header.subList(from, to);
            for (CSVRecord rec : p) {
                if (!rec.isConsistent()) {
                    continue;
                }
                Map<String, Double> figures = new LinkedHashMap<>();
                for (String f : figureColumns) {
                    figures.put(f, number(rec.get(f)));
                }
                String failed = rec.get("failed_rules");
                rows.add(new Row(rec.get("file"), rec.get("wafer_id"), rec.get("status"), rec.get("grade"), figures,
                        failed.isEmpty() ? List.of() : List.of(failed.split(";")),
                        number(rec.get("worst_region_area_mm2")), number(rec.get("worst_region_x_mm")),
                        number(rec.get("worst_region_y_mm")), number(rec.get("worst_region_peak")),
                        rec.get("error")));
            }
        }
        Map<String, WaferMap> recurrence = new TreeMap<>();
        try (Stream<Path> s = Files.list(outputDir)) {
            for (Path f : s.filter(f -> f.getFileName().toString().matches("recurrence-.*\\.tiff?")).sorted()
                    .toList()) {
                String family = f.getFileName().toString().replaceFirst("^recurrence-", "")
                        .replaceFirst("\\.tiff?$", "");
                try {
                    recurrence.put(family, MapFiles.readSingle(f));
                } catch (MapFormatException e) {
                    throw new IOException(f + ": cannot read the recurrence map: " + e.getMessage(), e);
                }
            }
        }
        return new Content(outputDir, rules, rows, recurrence, ZonedDateTime.now(), DEFAULT_HOT_SPOT_FRACTION);
    }

    /** Reads the batch's results and writes {@value #FILE_NAME} into its output folder; returns the file. */
    public static Path writeFor(Path outputDir, Rules rules) throws IOException {
        Path pdf = outputDir.resolve(FILE_NAME);
        write(read(outputDir, rules), pdf);
        return pdf;
    }

    private static double number(String s) {
        if (s == null || s.isEmpty()) {
            return Double.NaN;
        }
        try {
            return Double.parseDouble(s);
        } catch (NumberFormatException e) {
            return Double.NaN;
        }
    }

    /** Writes the summary into {@code pdf} (atomically). */
    public static void write(Content c, Path pdf) throws IOException {
        ChartExport.atomically(pdf, tmp -> {
            try (PDDocument doc = new PDDocument()) {
                doc.getDocumentInformation().setTitle("Batch inspection summary");
                doc.getDocumentInformation().setCreator("trapmap");
                summaryPage(doc, c);
                worstPages(doc, c);
                recurrencePages(doc, c);
                errorPages(doc, c);
                PdfPage.footers(doc, "trapmap batch summary - " + PdfPage.clean(c.outputDir().toString()) + " - "
                        + DATE.format(c.created()));
                doc.save(tmp.toFile());
            }
        });
    }

    // ---- page 1: yield, grades, distributions

    private static void summaryPage(PDDocument doc, Content c) throws IOException {
        float left = PdfPage.MARGIN;
        float full = PdfPage.WIDTH - 2 * PdfPage.MARGIN;
        PdfPage p = new PdfPage(doc);
        try {
            float y = PdfPage.MARGIN;
            p.text("Batch inspection summary", left, y, PdfPage.BOLD, 16);
            y += 21;
            p.text(PdfPage.fit(c.rows().size() + " wafers - results in " + c.outputDir() + " - "
                    + DATE.format(c.created()), PdfPage.REGULAR, 9, full), left, y, PdfPage.REGULAR, 9, PdfPage.MUTED);
            y += 18;

            long n = c.rows().size();
            long pass = c.count("pass");
            long fail = c.count("fail");
            long error = n - pass - fail;
            float half = (full - 16) / 2;
            p.heading("Yield", left, y, half);
            List<String[]> yield = new ArrayList<>();
            yield.add(new String[] {"status", "wafers", "share"});
            yield.add(new String[] {"pass", Long.toString(pass), share(pass, n)});
            yield.add(new String[] {"fail", Long.toString(fail), share(fail, n)});
            yield.add(new String[] {"error (not inspected)", Long.toString(error), share(error, n)});
            yield.add(new String[] {"all", Long.toString(n), n == 0 ? "n/a" : "100.0 %"});
            float h1 = p.table(left, y + 20, new float[] {half * 0.5f, half * 0.25f, half * 0.25f},
                    new boolean[] {false, true, true}, yield, 9, true);
            p.text("Yield " + share(pass, n) + " (pass over all inspected files)", left, y + 24 + h1, PdfPage.BOLD,
                    10, pass == n ? PASS : FAIL);
            p.text(error == 0 ? "Every file was read and inspected." : error + " file" + (error == 1 ? "" : "s")
                    + " could not be inspected: see the last page" + (error == 1 ? "." : "s."), left, y + 38 + h1,
                    PdfPage.REGULAR, 8.5f, PdfPage.MUTED);

            float gx = left + half + 16;
            p.heading("Grades", gx, y, half);
            Map<String, Long> grades = new TreeMap<>();
            for (Row r : c.rows()) {
                if (!r.status().equals("error")) {
                    grades.merge(r.grade().isEmpty() ? "(none)" : r.grade(), 1L, Long::sum);
                }
            }
            List<String[]> g = new ArrayList<>();
            g.add(new String[] {"grade", "wafers", "share"});
            grades.forEach((k, v) -> g.add(new String[] {k, Long.toString(v), share(v, n)}));
            if (grades.isEmpty()) {
                g.add(new String[] {"no graded wafers", "", ""});
            }
            float h2 = p.table(gx, y + 20, new float[] {half * 0.5f, half * 0.25f, half * 0.25f},
                    new boolean[] {false, true, true}, g, 9, true);
            y += 20 + Math.max(h1 + 32, h2) + 10;

            if (c.rules() != null) {
                Rules.Flag f = c.rules().flag();
                String flag = "Flagged: " + f.quantity().key() + (f.quantity() == Rules.FlagQuantity.LIFETIME
                        ? " below " : " above ") + Labels.number(f.threshold(), f.quantity().unit())
                        + (f.minAreaMm2() > 0 ? " in regions of at least " + Labels.number(f.minAreaMm2()) + " mm²"
                        : "") + "; edge exclusion " + Labels.number(c.rules().edgeExclusionMm()) + " mm"
                        + (c.rules().defectId() == null ? "" : "; defect " + c.rules().defectId()) + ".";
                y += p.paragraph(flag, left, y, full, PdfPage.REGULAR, 8.5f) + 6;
            }

            p.heading("Distributions over the inspected wafers (red lines: limits)", left, y, full);
            y += 22;
            List<String> figures = figureNames(c);
            float cw = (full - 12) / 2;
            float ch = 114;
            int i = 0;
            for (String f : figures) {
                if (y + ch > PdfPage.HEIGHT - PdfPage.MARGIN - 44) {
                    p.close();
                    p = new PdfPage(doc);
                    y = PdfPage.MARGIN;
                    p.heading("Distributions (continued)", left, y, full);
                    y += 22;
                    i = 0;
                }
                float x = left + (i % 2) * (cw + 12);
                p.image(ChartExport.image(distribution(c, f), (int) cw, (int) ch, SCALE), x, y, cw, ch);
                i++;
                if (i % 2 == 0) {
                    y += ch + 6;
                }
            }
            if (i % 2 == 1) {
                y += ch + 6;
            }
            p.caution(WaferReport.CAUTION, left, Math.max(y + 2, PdfPage.HEIGHT - PdfPage.MARGIN - 36), full);
        } finally {
            p.close();
        }
    }

    private static String share(long k, long n) {
        return n == 0 ? "n/a" : Labels.percent((double) k / n);
    }

    private static List<String> figureNames(Content c) {
        List<String> names = new ArrayList<>();
        for (Row r : c.rows()) {
            for (String f : r.figures().keySet()) {
                if (!names.contains(f)) {
                    names.add(f);
                }
            }
        }
        return names;
    }

    /** Histogram of one figure over the wafers that have it, with the rules' limits as red lines. */
    static JFreeChart distribution(Content c, String figure) {
        double[] v = c.rows().stream().mapToDouble(r -> r.figure(figure)).filter(Double::isFinite).toArray();
        String unit = unitOf(figure);
        boolean log = figure.startsWith("trap_density_");
        XYIntervalSeries s = new XYIntervalSeries("wafers", false, true);
        double lo = java.util.Arrays.stream(v).min().orElse(0);
        double hi = java.util.Arrays.stream(v).max().orElse(1);
        List<Double> limits = new ArrayList<>();
        if (c.rules() != null) {
            for (Rules.Limit l : c.rules().limits()) {
                if (l.figure().name().equals(figure)) {
                    if (!Double.isNaN(l.min())) {
                        limits.add(l.min());
                    }
                    if (!Double.isNaN(l.max())) {
                        limits.add(l.max());
                    }
                }
            }
        }
        for (double l : limits) {
            if (!log || l > 0) {
                lo = Math.min(lo, l);
                hi = Math.max(hi, l);
            }
        }
        log &= lo > 0;
        if (!(hi > lo)) {
            double pad = lo == 0 ? 0.5 : Math.abs(lo) * 0.1;
            lo -= pad;
            hi += pad;
        }
        int bins = Math.max(5, Math.min(20, (int) Math.ceil(Math.sqrt(Math.max(v.length, 1))) * 2));
        double a = log ? Math.log10(lo) : lo;
        double b = log ? Math.log10(hi) : hi;
        double width = (b - a) / bins;
        int[] counts = new int[bins];
        for (double x : v) {
            double t = log ? Math.log10(x) : x;
            int k = (int) Math.min(bins - 1, Math.max(0, Math.floor((t - a) / width)));
            counts[k]++;
        }
        for (int k = 0; k < bins; k++) {
            double e0 = a + k * width;
            double e1 = e0 + width;
            double x0 = log ? Math.pow(10, e0) : e0;
            double x1 = log ? Math.pow(10, e1) : e1;
            s.add(log ? Math.sqrt(x0 * x1) : (x0 + x1) / 2, x0, x1, counts[k], 0, counts[k]);
        }
        XYIntervalSeriesCollection ds = new XYIntervalSeriesCollection();
        ds.addSeries(s);
        String label = figure + (unit.isEmpty() ? "" : " (" + unit + ")");
        ValueAxis x;
        if (log) {
            x = ChartStyle.logAxis(label);
        } else {
            NumberAxis nx = new NumberAxis(label);
            nx.setAutoRangeIncludesZero(false);
            nx.setNumberFormatOverride(ChartStyle.TICK_FORMAT);
            x = nx;
        }
        double pad = log ? Math.pow(hi / lo, 0.05) : 0.05 * (hi - lo);
        x.setRange(log ? lo / pad : lo - pad, log ? hi * pad : hi + pad);
        NumberAxis y = new NumberAxis("wafers");
        y.setStandardTickUnits(NumberAxis.createIntegerTickUnits());
        XYBarRenderer r = new XYBarRenderer(0.08);
        r.setBarPainter(new StandardXYBarPainter());
        r.setShadowVisible(false);
        r.setSeriesPaint(0, new Color(0x3A6EA5));
        XYPlot plot = new XYPlot(ds, x, y, r);
        for (double l : limits) {
            plot.addDomainMarker(new ValueMarker(l, FAIL, new BasicStroke(1.5f)));
        }
        JFreeChart chart = new JFreeChart(null, null, plot, false);
        chart.setBackgroundPaint(Color.WHITE);
        plot.setBackgroundPaint(Color.WHITE);
        plot.setRangeGridlinePaint(new Color(0xDDDDDD));
        plot.setDomainGridlinePaint(new Color(0xDDDDDD));
        java.awt.Font small = new java.awt.Font(java.awt.Font.SANS_SERIF, java.awt.Font.PLAIN, 10);
        java.awt.Font tick = new java.awt.Font(java.awt.Font.SANS_SERIF, java.awt.Font.PLAIN, 9);
        x.setLabelFont(small);
        x.setTickLabelFont(tick);
        y.setLabelFont(small);
        y.setTickLabelFont(tick);
        return chart;
    }

    /** The unit of a results column, from the figure's definition ("" when unknown or dimensionless). */
    static String unitOf(String figure) {
        try {
            return Labels.unit(Figure.parse(figure).unit());
        } catch (IllegalArgumentException e) {
            return "";
        }
    }

    // ---- worst wafers

    /** The inspected wafers, worst first: most failed rules, then the largest flagged area fraction. */
    static List<Row> worst(Content c) {
        Comparator<Row> order = Comparator.<Row>comparingInt(r -> r.failed().size()).reversed()
                .thenComparing(Comparator.<Row>comparingDouble(r -> {
                    double f = r.figure("flagged_area_fraction");
                    return Double.isNaN(f) ? -1 : f;
                }).reversed());
        return c.rows().stream().filter(r -> !r.status().equals("error")).sorted(order).limit(WORST_WAFERS).toList();
    }

    private static void worstPages(PDDocument doc, Content c) throws IOException {
        List<Row> worst = worst(c);
        if (worst.isEmpty()) {
            return;
        }
        float left = PdfPage.MARGIN;
        float full = PdfPage.WIDTH - 2 * PdfPage.MARGIN;
        try (PdfPage p = new PdfPage(doc)) {
            float y = PdfPage.MARGIN;
            p.text("Worst wafers", left, y, PdfPage.BOLD, 14);
            y += 18;
            p.text("Most failed rules first, then the largest flagged area fraction; magenta: flagged regions, circle:"
                    + " the largest region.", left, y, PdfPage.REGULAR, 8.5f, PdfPage.MUTED);
            y += 16;
            float cellH = 244;
            float pic = 150;
            float cw = (full - 12) / 2;
            for (int i = 0; i < worst.size(); i++) {
                Row r = worst.get(i);
                float x = left + (i % 2) * (cw + 12);
                float top = y + (i / 2) * cellH;
                p.rect(x, top, cw, cellH - 8, PdfPage.RULE, null, 0.6f);
                BufferedImage img = picture(c, r, (int) (pic * SCALE));
                if (img != null) {
                    p.image(img, x + 6, top + 6, pic, pic);
                } else {
                    p.paragraph("no picture: the map could not be read again", x + 6, top + 6, pic, PdfPage.REGULAR, 8);
                }
                float tx = x + pic + 14;
                float tw = cw - pic - 20;
                p.text(PdfPage.fit(r.name(), PdfPage.BOLD, 10, tw), tx, top + 8, PdfPage.BOLD, 10);
                p.text(PdfPage.fit(Path.of(r.file()).getFileName().toString(), PdfPage.REGULAR, 7, tw), tx, top + 21,
                        PdfPage.REGULAR, 7, PdfPage.MUTED);
                p.text(r.status().toUpperCase(Locale.ROOT) + (r.grade().isEmpty() ? "" : ", grade " + r.grade()), tx,
                        top + 32, PdfPage.BOLD, 9, r.status().equals("pass") ? PASS : FAIL);
                float ty = top + 46;
                if (!r.failed().isEmpty()) {
                    ty += p.paragraph("failed: " + String.join(", ", r.failed()), tx, ty, tw, PdfPage.REGULAR, 7.5f);
                }
                if (Double.isFinite(r.worstAreaMm2())) {
                    ty += p.paragraph("largest region " + Labels.number(r.worstAreaMm2()) + " mm² at ("
                            + Labels.number(r.worstXMm()) + ", " + Labels.number(r.worstYMm()) + ") mm, peak "
                            + Labels.number(r.worstPeak(), flagUnit(c)), tx, ty, tw, PdfPage.REGULAR, 7.5f);
                } else {
                    ty += p.paragraph("no flagged region", tx, ty, tw, PdfPage.REGULAR, 7.5f);
                }
                List<String[]> figs = new ArrayList<>();
                for (Map.Entry<String, Double> e : r.figures().entrySet()) {
                    String u = unitOf(e.getKey());
                    figs.add(new String[] {e.getKey(), Labels.number(e.getValue()) + (u.isEmpty() ? "" : " " + u)});
                }
                p.table(x + 6, top + pic + 12, new float[] {(cw - 12) * 0.6f, (cw - 12) * 0.4f},
                        new boolean[] {false, true}, figs.subList(0, Math.min(figs.size(), 8)), 7, false);
            }
        }
    }

    private static String flagUnit(Content c) {
        return c.rules() == null ? "" : c.rules().flag().quantity().unit();
    }

    /** The wafer's thumbnail, or its map drawn with the largest flagged region circled; null when neither exists. */
    private static BufferedImage picture(Content c, Row r, int size) {
        Path thumb = c.outputDir().resolve(BatchInspection.THUMBNAIL_DIR).resolve(Path.of(r.file()).getFileName()
                + ".png");
        try {
            if (Files.isRegularFile(thumb)) {
                BufferedImage t = ImageIO.read(thumb.toFile());
                if (t != null) {
                    return onWhite(t, size);
                }
            }
            WaferMap m = MapFiles.readSingle(Path.of(r.file()));
            DisplayStyle style = MapPicture.styleOf(m, null);
            BufferedImage img = MapPicture.render(m, style, null, null, 0, size);
            if (Double.isFinite(r.worstAreaMm2())) {
                double scale = Math.min((double) size / m.width(), (double) size / m.height());
                double ox = (size - m.width() * scale) / 2;
                double oy = (size - m.height() * scale) / 2;
                double cx = ox + (m.grid().xPx(r.worstXMm()) + 0.5) * scale;
                double cy = oy + (m.grid().yPx(r.worstYMm()) + 0.5) * scale;
                double radius = Math.max(6, 1.3 * Math.sqrt(r.worstAreaMm2() / Math.PI) / m.grid().pitchMm() * scale);
                Graphics2D g = img.createGraphics();
                g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
                g.setColor(MapPicture.FLAG);
                g.setStroke(new BasicStroke(3f));
                g.draw(new Ellipse2D.Double(cx - radius, cy - radius, 2 * radius, 2 * radius));
                g.dispose();
            }
            return img;
        } catch (IOException | RuntimeException e) {
            return null;
        }
    }

    private static BufferedImage onWhite(BufferedImage t, int size) {
        BufferedImage out = new BufferedImage(size, size, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = out.createGraphics();
        g.setColor(Color.WHITE);
        g.fillRect(0, 0, size, size);
        double s = Math.min((double) size / t.getWidth(), (double) size / t.getHeight());
        int w = (int) Math.round(t.getWidth() * s);
        int h = (int) Math.round(t.getHeight() * s);
        g.setRenderingHint(RenderingHints.KEY_INTERPOLATION, RenderingHints.VALUE_INTERPOLATION_NEAREST_NEIGHBOR);
        g.drawImage(t, (size - w) / 2, (size - h) / 2, w, h, null);
        g.dispose();
        return out;
    }

    // ---- recurrence

    /** Hot spots of a recurrence map: connected cells flagged on more than {@code fraction} of the wafers. */
    static RegionTable hotSpots(WaferMap recurrence, double fraction) {
        return ThresholdRegions.find(recurrence, null, RegionCriteria.above(fraction, 0), null);
    }

    private static String wafers(WaferMap m) {
        for (ProcessingStep s : m.provenance().steps()) {
            String w = s.parameters().get("wafers");
            if (w != null) {
                return w;
            }
        }
        return "?";
    }

    private static void recurrencePages(PDDocument doc, Content c) throws IOException {
        float left = PdfPage.MARGIN;
        float full = PdfPage.WIDTH - 2 * PdfPage.MARGIN;
        for (Map.Entry<String, WaferMap> e : c.recurrence().entrySet()) {
            WaferMap m = e.getValue();
            try (PdfPage p = new PdfPage(doc)) {
                float y = PdfPage.MARGIN;
                p.text("Recurrence: " + e.getKey(), left, y, PdfPage.BOLD, 14);
                y += 18;
                p.paragraph("Share of the " + wafers(m) + " wafers of this family with a flagged region at each "
                        + Labels.number(m.grid().pitchMm()) + " mm cell (wafer coordinates; grey: no wafer covers the"
                        + " cell). Hot spots: cells flagged on more than " + Labels.percent(c.hotSpotFraction())
                        + " of the wafers, outlined in magenta.", left, y, full, PdfPage.REGULAR, 8.5f);
                y += 30;
                double top = 0;
                for (float v : m.raster().samples()) {
                    if (v > top) {
                        top = v;
                    }
                }
                // the colours span 0 to the highest share (at least 10 %), in steps of 10 %
                DisplayStyle style = new DisplayStyle(ColourMap.BLUE_YELLOW, false, 0,
                        Math.max(0.1, Math.ceil(top * 10 - 1e-9) / 10));
                RegionTable hot = hotSpots(m, c.hotSpotFraction());
                java.util.BitSet flagged = new java.util.BitSet();
                float[] s = m.raster().samples();
                for (int i = 0; i < s.length; i++) {
                    if (s[i] > c.hotSpotFraction()) {
                        flagged.set(i);
                    }
                }
                float size = 330;
                p.image(MapPicture.render(m, style, flagged, null, 0, (int) (size * SCALE)), left, y, size, size);
                p.image(MapPicture.colourBarImage(style, "share of wafers flagged", 70, (int) size, SCALE),
                        left + size + 6, y, 70, size);
                y += size + 14;
                p.heading("Hot spots", left, y, full);
                y += 20;
                String sum = hot.size() == 0 ? "No cell is flagged on more than " + Labels.percent(c.hotSpotFraction())
                        + " of the wafers."
                        : hot.size() + " hot spot" + (hot.size() == 1 ? "" : "s") + ", " + Labels.number(
                        hot.totalAreaMm2()) + " mm² in all" + (hot.size() > 10 ? "; the ten largest:" : ":");
                y += p.paragraph(sum, left, y, full, PdfPage.REGULAR, 8.5f) + 2;
                if (hot.size() > 0) {
                    List<String[]> rows = new ArrayList<>();
                    rows.add(new String[] {"hot spot", "area (mm²)", "centre x (mm)", "centre y (mm)",
                        "highest share", "mean share"});
                    for (Region r : hot.byArea().subList(0, Math.min(10, hot.size()))) {
                        rows.add(new String[] {"#" + r.id(), Labels.number(r.areaMm2()), Labels.number(r.centroidXMm()),
                            Labels.number(r.centroidYMm()), Labels.percent(r.peakValue()),
                            Labels.percent(r.meanValue())});
                    }
                    float cw = full / 6;
                    p.table(left, y, new float[] {cw, cw, cw, cw, cw, cw},
                            new boolean[] {false, true, true, true, true, true}, rows, 8, true);
                }
            }
        }
    }

    // ---- errors and caution

    private static void errorPages(PDDocument doc, Content c) throws IOException {
        List<Row> errors = c.rows().stream().filter(r -> r.status().equals("error")).toList();
        if (errors.isEmpty()) {
            return;
        }
        float left = PdfPage.MARGIN;
        float full = PdfPage.WIDTH - 2 * PdfPage.MARGIN;
        PdfPage p = new PdfPage(doc);
        try {
            float y = PdfPage.MARGIN;
            p.text("Files not inspected", left, y, PdfPage.BOLD, 14);
            y += 22;
            for (Row r : errors) {
                if (y > PdfPage.HEIGHT - PdfPage.MARGIN - 110) {
                    p.close();
                    p = new PdfPage(doc);
                    y = PdfPage.MARGIN;
                    p.text("Files not inspected (continued)", left, y, PdfPage.BOLD, 14);
                    y += 22;
                }
                p.text(PdfPage.fit(r.file(), PdfPage.BOLD, 8.5f, full), left, y, PdfPage.BOLD, 8.5f);
                y += 12;
                y += p.paragraph(r.error().isEmpty() ? "no reason given" : r.error(), left + 12, y, full - 12,
                        PdfPage.REGULAR, 8) + 5;
            }
            y += 14;
            p.caution(WaferReport.CAUTION, left, y, full);
        } finally {
            p.close();
        }
    }
}
