package trapmap.viewer.report;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Path;
import java.time.ZonedDateTime;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.BitSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.pdmodel.PDDocumentInformation;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.title.TextTitle;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PitchPrecision;
import trapmap.maps.region.Region;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.RegionTable;
import trapmap.physics.defect.Defect;
import trapmap.physics.material.Doping;
import trapmap.shared.text.TextLimits;
import trapmap.viewer.graphics.ChartExport;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.graphics.HistogramChart;
import trapmap.viewer.graphics.Labels;

/**
 * One A4 page per wafer: title (wafer, file, date), the map with its colour bar, flagged regions outlined and the
 * wafer edge, its histogram and statistics with units, the measurement settings, the defect with its parameters and
 * source, the flagged regions, notes and the caution. Works headless ({@code java.awt.headless=true}); charts and the
 * map are embedded as pictures at {@value #SCALE}× for print.
 */
public final class WaferReport {
    /** Shown in a box on every report whose numbers drive decisions. */
    public static final String CAUTION = trapmap.maps.model.Caution.TEXT;
    /** Picture pixels per PDF point. */
    static final double SCALE = 2;
    /** The lowest histogram worth drawing, points: below it the page leaves the histogram out. */
    static final float MIN_HISTOGRAM_HEIGHT = 90;
    /** The smallest map the page draws, points (the statistics beside it are about as tall). */
    static final float MIN_MAP_SIZE = 190;
    private static final DateTimeFormatter DATE = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm z", Locale.ROOT);

    /**
     * What one page shows. Make one with {@link #of(WaferMap, String)} and add what is known with the
     * {@code with…} methods; everything but the map may stay empty.
     *
     * @param map             the map shown and summarised (lifetime, trap density, …), in its own unit
     * @param file            the file it came from, as shown to the user ("" when none)
     * @param created         the date printed on the report
     * @param style           colours and range as shown in the viewer; null: BLUE_YELLOW over the 1st–99th
     *                        percentile, log scale for quantities that span decades
     * @param statisticsMask  the pixels the histogram and statistics use (e.g. the wafer less the edge exclusion);
     *                        null: every pixel with data
     * @param threshold       the flag threshold in the map's unit, marked on the histogram; NaN for none
     * @param flagged         pixels to outline (bit y·width + x), null for none
     * @param outline         the wafer outline to draw, null for none
     * @param edgeExclusionMm width of the excluded rim, mm (0 for none)
     * @param conditions      the measurement settings used (usually the map's, after the user's overrides)
     * @param defect          the defect of an equivalent-density map, null when none was used
     * @param regions         the flagged regions, null when none were searched
     * @param notes           further lines (conversion warnings, processing), each printed as a bullet
     * @param judgement       how the wafer was judged (verdict, grade, rules, defect, failed rules), null for none
     * @param regionUnit      the unit of the regions' threshold, peak and mean (the flagged quantity's, which may
     *                        differ from the map's); null: the map's
     */
    public record Content(WaferMap map, String file, ZonedDateTime created, DisplayStyle style, Mask statisticsMask,
                          double threshold, BitSet flagged, WaferShape outline, double edgeExclusionMm,
                          MeasurementConditions conditions, Defect defect, RegionTable regions, List<String> notes,
                          Judgement judgement, String regionUnit) {
        public Content {
            if (map == null) {
                throw new IllegalArgumentException("a wafer report needs a map");
            }
            file = file == null ? "" : file;
            created = created == null ? ZonedDateTime.now() : created;
            conditions = conditions == null ? map.conditions() : conditions;
            notes = notes == null ? List.of() : List.copyOf(notes);
            if (!(edgeExclusionMm >= 0)) {
                edgeExclusionMm = 0;
            }
        }

        /** A page of {@code map} read from {@code file}, dated now, with nothing else known. */
        public static Content of(WaferMap map, String file) {
            return new Content(map, file, ZonedDateTime.now(), null, null, Double.NaN, null, null, 0, null, null,
                    null, List.of(), null, null);
        }

        public Content withCreated(ZonedDateTime t) {
            return new Content(map, file, t, style, statisticsMask, threshold, flagged, outline, edgeExclusionMm,
                    conditions, defect, regions, notes, judgement, regionUnit);
        }

        public Content withStyle(DisplayStyle s) {
            return new Content(map, file, created, s, statisticsMask, threshold, flagged, outline, edgeExclusionMm,
                    conditions, defect, regions, notes, judgement, regionUnit);
        }

        public Content withStatisticsMask(Mask m) {
            return new Content(map, file, created, style, m, threshold, flagged, outline, edgeExclusionMm, conditions,
                    defect, regions, notes, judgement, regionUnit);
        }

        /** The flag threshold (map unit), the flagged pixels and the regions found. */
        public Content withFlags(double t, BitSet f, RegionTable r) {
            return new Content(map, file, created, style, statisticsMask, t, f, outline, edgeExclusionMm, conditions,
                    defect, r, notes, judgement, regionUnit);
        }

        public Content withOutline(WaferShape shape, double exclusionMm) {
            return new Content(map, file, created, style, statisticsMask, threshold, flagged, shape, exclusionMm,
                    conditions, defect, regions, notes, judgement, regionUnit);
        }

        public Content withConditions(MeasurementConditions c) {
            return new Content(map, file, created, style, statisticsMask, threshold, flagged, outline,
                    edgeExclusionMm, c, defect, regions, notes, judgement, regionUnit);
        }

        public Content withDefect(Defect d) {
            return new Content(map, file, created, style, statisticsMask, threshold, flagged, outline,
                    edgeExclusionMm, conditions, d, regions, notes, judgement, regionUnit);
        }

        public Content withNotes(List<String> n) {
            return new Content(map, file, created, style, statisticsMask, threshold, flagged, outline,
                    edgeExclusionMm, conditions, defect, regions, n, judgement, regionUnit);
        }

        /** The flag threshold (in {@code unit}, the flagged quantity's), the flagged pixels and the regions found. */
        public Content withFlags(double t, BitSet f, RegionTable r, String unit) {
            return new Content(map, file, created, style, statisticsMask, t, f, outline, edgeExclusionMm, conditions,
                    defect, r, notes, judgement, unit);
        }

        /** The judgement stated at the top of the page. */
        public Content withJudgement(Judgement j) {
            return new Content(map, file, created, style, statisticsMask, threshold, flagged, outline,
                    edgeExclusionMm, conditions, defect, regions, notes, j, regionUnit);
        }

        /** The wafer id, or the file name when the map has none. */
        public String title() {
            if (!map.waferId().isEmpty()) {
                return map.waferId();
            }
            return file.isEmpty() ? "unnamed wafer" : Path.of(file).getFileName().toString();
        }
    }

    /**
     * How the wafer was judged, printed under the title.
     *
     * @param pass     the outcome (colours the headline)
     * @param headline one line, e.g. "PASS - grade A" or "Quick threshold check: FAIL (not a rules verdict)"
     * @param rows     label-value rows: rules and profile, defect, failed rules, graded down by, flag
     */
    public record Judgement(boolean pass, String headline, List<String[]> rows) {
        public Judgement {
            rows = List.copyOf(rows);
        }
    }

    private static final java.awt.Color PASS = new java.awt.Color(0x2E8B57);
    private static final java.awt.Color FAIL = new java.awt.Color(0xC02020);

    private WaferReport() {
    }

    /** A title for the document's properties: at most {@link TextLimits#MAX_ID_CHARS} characters and dots. */
    private static String shortTitle(String t) {
        return t.length() <= TextLimits.MAX_ID_CHARS ? t : t.substring(0, TextLimits.MAX_ID_CHARS) + "...";
    }

    /** Writes one page per content into {@code pdf} (atomically). */
    public static void write(List<Content> pages, Path pdf) throws IOException {
        if (pages.isEmpty()) {
            throw new IllegalArgumentException("a wafer report needs at least one wafer");
        }
        ChartExport.atomically(pdf, tmp -> {
            try (PDDocument doc = new PDDocument()) {
                PDDocumentInformation info = doc.getDocumentInformation();
                info.setTitle("Wafer report " + PdfPage.clean(shortTitle(pages.get(0).title())) + (pages.size() > 1 ? " and "
                        + (pages.size() - 1) + " more" : ""));
                info.setCreator("trapmap");
                for (Content c : pages) {
                    page(doc, c);
                }
                PdfPage.footers(doc, "trapmap wafer report - " + CAUTION);
                doc.save(tmp.toFile());
            }
        });
    }

    /** Writes one page into {@code pdf} (atomically). */
    public static void write(Content page, Path pdf) throws IOException {
        write(List.of(page), pdf);
    }

    private static void page(PDDocument doc, Content c) throws IOException {
        WaferMap map = c.map();
        HistogramChart.Data hist = HistogramChart.compute(map, c.statisticsMask(), c.threshold());
        DisplayStyle style = MapPicture.styleOf(map, c.style());
        float left = PdfPage.MARGIN;
        float full = PdfPage.WIDTH - 2 * PdfPage.MARGIN;
        try (PdfPage p = new PdfPage(doc)) {
            float y = PdfPage.MARGIN;
            p.text(PdfPage.fit("Wafer " + c.title(), PdfPage.BOLD, 16, full), left, y, PdfPage.BOLD, 16);
            y += 21;
            String sub = Labels.name(map.quantity()) + " map" + (c.file().isEmpty() ? "" : " - " + c.file()) + " - "
                    + DATE.format(c.created());
            p.text(PdfPage.fit(sub, PdfPage.REGULAR, 9, full), left, y, PdfPage.REGULAR, 9, PdfPage.MUTED);
            y += 16;
            Judgement j = c.judgement();
            if (j != null) {
                p.text(PdfPage.fit(j.headline(), PdfPage.BOLD, 13, full), left, y, PdfPage.BOLD, 13, j.pass() ? PASS
                        : FAIL);
                y += 18;
                y += p.table(left, y, new float[] {full * 0.16f, full * 0.84f}, null, j.rows(), 8, false) + 8;
            }

            // what follows the histogram, measured first: the map and the histogram take the room it leaves
            float lowerH;
            try (PdfPage dry = PdfPage.measuringOnly()) {
                lowerH = lower(dry, c, 0, left, full);
            }
            float cautionH = PdfPage.cautionHeight(CAUTION, full);
            float end = PdfPage.HEIGHT - PdfPage.MARGIN - cautionH - 8 - lowerH;
            // a map of codes (statuses) has no histogram: its values are names, not amounts
            boolean codes = HistogramChart.categorical(map.quantity());
            float histWanted = codes ? 0 : c.judgement() == null ? 170 : 120;

            // map with colour bar (left), statistics (right)
            float mapSize = Math.max(MIN_MAP_SIZE, Math.min(240, end - y - 30 - histWanted - 8));
            float barWidth = 78;
            BufferedImage pic = MapPicture.render(map, style, c.flagged(), c.outline(), c.edgeExclusionMm(),
                    (int) Math.round(mapSize * SCALE));
            p.image(pic, left, y, mapSize, mapSize);
            p.image(MapPicture.colourBarImage(style, MapPicture.label(map), (int) barWidth, (int) mapSize, SCALE,
                    codes),
                    left + mapSize + 4, y, barWidth, mapSize);
            float legendY = y + mapSize + 3;
            String legend = "grey: no data" + (c.flagged() != null ? "; magenta: flagged pixels" : "")
                    + (c.outline() != null ? "; dark line: wafer edge" + (c.edgeExclusionMm() > 0 ? ", grey dashes: "
                    + Labels.number(c.edgeExclusionMm()) + " mm edge exclusion" : "") : "");
            p.paragraph(legend, left, legendY, mapSize + barWidth, PdfPage.REGULAR, 7.5f);

            float sx = left + mapSize + barWidth + 16;
            float sw = PdfPage.WIDTH - PdfPage.MARGIN - sx;
            p.heading("Statistics", sx, y, sw);
            List<String[]> rows = new ArrayList<>();
            for (HistogramChart.Row r : hist.rows()) {
                rows.add(new String[] {r.name(), r.value(), r.unit()});
            }
            float statsH = p.table(sx, y + 20, new float[] {sw * 0.58f, sw * 0.29f, sw * 0.13f},
                    new boolean[] {false, true, false}, rows, 8, false);
            y = Math.max(legendY + 22, y + 20 + statsH + 4);

            // histogram across the page, as tall as the room left allows (left out when too little is left)
            float histH = Math.min(histWanted, end - y - 8);
            if (!codes && histH >= MIN_HISTOGRAM_HEIGHT) {
                histogram(p, hist, left, y, full, histH);
                y += histH + 8;
            }
            y = lower(p, c, y, left, full);
            float cautionY = Math.max(y + 8, PdfPage.HEIGHT - PdfPage.MARGIN - cautionH);
            p.caution(CAUTION, left, cautionY, full);
        }
    }

    /**
     * The histogram in {@code width} × {@code height} points: its title and subtitle as a line of text, the chart
     * below without them, drawn {@value #CHART_ENLARGED}× as large and shrunk to fit, so that its fonts match the
     * page's and its plot keeps the height the titles would take.
     */
    private static void histogram(PdfPage p, HistogramChart.Data hist, float x, float y, float width, float height)
            throws IOException {
        JFreeChart chart = HistogramChart.createChart(hist);
        StringBuilder title = new StringBuilder(chart.getTitle() == null ? "" : chart.getTitle().getText());
        for (int i = 0; i < chart.getSubtitleCount(); i++) {
            if (chart.getSubtitle(i) instanceof TextTitle t) {
                title.append(title.length() == 0 ? "" : ": ").append(t.getText());
            }
        }
        chart.setTitle((TextTitle) null);
        chart.clearSubtitles();
        // the plot is lower than "share of area (%)" is long
        chart.getXYPlot().getRangeAxis().setLabel("area (%)");
        float titleH = 12;
        p.text(PdfPage.fit(title.toString(), PdfPage.BOLD, 8.5f, width), x, y, PdfPage.BOLD, 8.5f);
        float chartH = height - titleH;
        p.image(ChartExport.image(chart, Math.round(width * CHART_ENLARGED), Math.round(chartH * CHART_ENLARGED),
                SCALE / CHART_ENLARGED), x, y + titleH, width, chartH);
    }

    /** How much larger than its place on the page the histogram is drawn (its fonts are for screens). */
    static final float CHART_ENLARGED = 1.45f;

    /** Settings, defect, flagged regions and notes from {@code y} down; returns where they end. */
    private static float lower(PdfPage p, Content c, float y, float left, float full) throws IOException {
        // settings (left) and defect (right)
        float half = (full - 16) / 2;
        float top = y;
        p.heading("Measurement settings", left, y, half);
        float h1 = p.table(left, y + 20, new float[] {half * 0.42f, half * 0.58f}, null, settings(c.conditions()),
                8, false);
        p.heading("Defect", left + half + 16, top, half);
        float h2 = p.table(left + half + 16, top + 20, new float[] {half * 0.30f, half * 0.70f}, null,
                defect(c.defect()), 8, false);
        float sourceH = 0;
        if (c.defect() != null && !c.defect().source().isEmpty()) {
            sourceH = p.paragraph("Source: " + c.defect().source(), left + half + 16, top + 20 + h2 + 2, half,
                    PdfPage.REGULAR, 7.5f);
        }
        y = top + 20 + Math.max(h1, h2 + sourceH + 2) + 8;

        // regions
        p.heading("Flagged regions", left, y, full);
        y += 20;
        y += regions(p, c, left, y, full);

        if (!c.notes().isEmpty()) {
            y += 4;
            for (String n : c.notes()) {
                y += p.paragraph("- " + n, left, y, full, PdfPage.REGULAR, 8);
            }
        }
        return y;
    }

    /** Rows of the measurement settings table, the sidecar's facts included. */
    static final int SETTINGS_ROWS = 8;

    static List<String[]> settings(MeasurementConditions m) {
        List<String[]> r = new ArrayList<>();
        Doping d = m.doping();
        r.add(new String[] {"doping", d == null ? "unknown" : (d.type().name().toLowerCase(Locale.ROOT)
                + "-type " + Labels.number(d.densityPerCm3()) + " " + Typeset.PER_CM3 + " ("
                + Labels.number(d.resistivityOhmCm())
                + " " + Typeset.OHM_CM + ")")});
        r.add(new String[] {"thickness", m.thicknessUm() == null ? "unknown" : Labels.number(m.thicknessUm()) + " µm"});
        r.add(new String[] {"temperature", m.temperatureK() == null ? "300 K (default)"
                : Labels.number(m.temperatureK()) + " K"});
        if (m.injectionPerCm3() != null) {
            r.add(new String[] {"injection " + Typeset.DELTA_N, Labels.number(m.injectionPerCm3()) + " "
                + Typeset.PER_CM3 + " (fixed)"});
        } else if (m.generationPerCm3PerS() != null) {
            r.add(new String[] {"generation G", Labels.number(m.generationPerCm3PerS()) + " " + Typeset.PER_CM3_S
                + " (" + Typeset.DELTA_N + " = G·" + Typeset.TAU + ")"});
        } else {
            r.add(new String[] {"injection", "unknown"});
        }
        r.add(new String[] {"surface", m.srvCmPerS() == null ? "ideal (no surface term)"
                : "S = " + Labels.number(m.srvCmPerS()) + " cm/s on both sides"});
        // the facts by name (the conditions keep them in no order), as many as the table has rows for; the last
        // row says how many more there are
        List<Map.Entry<String, String>> facts = new ArrayList<>(new java.util.TreeMap<>(m.extra()).entrySet());
        int room = SETTINGS_ROWS - r.size();
        int shown = facts.size() <= room ? facts.size() : Math.max(0, room - 1);
        for (Map.Entry<String, String> e : facts.subList(0, shown)) {
            r.add(new String[] {e.getKey().replace('_', ' '), e.getValue()});
        }
        if (shown < facts.size()) {
            int more = facts.size() - shown;
            r.add(new String[] {"more facts", more + (more == 1 ? " more fact" : " more facts") + " in the sidecar"});
        }
        return r;
    }

    static List<String[]> defect(Defect d) {
        List<String[]> r = new ArrayList<>();
        if (d == null) {
            r.add(new String[] {"defect", "none (map not converted)"});
            return r;
        }
        r.add(new String[] {"defect", d.id() + " - " + d.name()});
        r.add(new String[] {"level", d.level().toString()});
        r.add(new String[] {Typeset.SIGMA_N, Labels.number(d.electronCrossSectionCm2()) + " " + Typeset.CM2});
        r.add(new String[] {Typeset.SIGMA_P, Labels.number(d.holeCrossSectionCm2()) + " " + Typeset.CM2});
        r.add(new String[] {Typeset.SIGMA_N + "/" + Typeset.SIGMA_P, Labels.number(d.captureRatio())});
        r.add(new String[] {"v_th convention", d.velocityConvention().name().toLowerCase(Locale.ROOT)});
        return r;
    }

    private static float regions(PdfPage p, Content c, float x, float y, float width) throws IOException {
        RegionTable t = c.regions();
        if (t == null) {
            return p.paragraph("No region search was made.", x, y, width, PdfPage.REGULAR, 8);
        }
        RegionCriteria k = t.criteria();
        String unit = c.regionUnit() != null ? c.regionUnit() : c.map().quantity().unit();
        String summary = t.size() + " region" + (t.size() == 1 ? "" : "s") + " with values "
                + (k.side() == RegionCriteria.Side.ABOVE ? "above " : "below ") + Labels.number(k.threshold(), unit)
                + (k.minAreaMm2() > 0 ? " of at least " + Labels.number(k.minAreaMm2()) + " " + Typeset.MM2 : "")
                + ", " + PitchPrecision.areaMm2(t.totalAreaMm2(), c.map().grid().pitchMm()) + " " + Typeset.MM2
                + " in all"
                + (t.size() > 5 ? "; the five largest:" : ".");
        float h = p.paragraph(summary, x, y, width, PdfPage.REGULAR, 8);
        if (t.size() == 0) {
            return h;
        }
        List<String[]> rows = new ArrayList<>();
        String u = Typeset.unit(unit);
        double pitch = c.map().grid().pitchMm();
        rows.add(new String[] {"region", Typeset.headed("area", Typeset.MM2), "centre x (mm)", "centre y (mm)", "peak" + (u.isEmpty() ? ""
                : " (" + u + ")"), "mean" + (u.isEmpty() ? "" : " (" + u + ")"), "to edge (mm)"});
        for (Region r : t.byArea().subList(0, Math.min(5, t.size()))) {
            rows.add(new String[] {"#" + r.id(), PitchPrecision.areaMm2(r.areaMm2(), pitch),
                PitchPrecision.mm(r.centroidXMm(), pitch), PitchPrecision.mm(r.centroidYMm(), pitch),
                Labels.number(r.peakValue()), Labels.number(r.meanValue()), PitchPrecision.mm(r.edgeDistanceMm(), pitch)});
        }
        float cw = width / 7;
        return h + 2 + p.table(x, y + h + 2, new float[] {cw, cw, cw, cw, cw, cw, cw},
                new boolean[] {false, true, true, true, true, true, true}, rows, 8, true);
    }
}
