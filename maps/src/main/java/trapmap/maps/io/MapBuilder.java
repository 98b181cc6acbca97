package trapmap.maps.io;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.function.DoubleUnaryOperator;
import trapmap.maps.model.MapHeader;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.units.LifetimeUnit;

/**
 * Turns decoded samples and what is known about them (embedded metadata, sidecar, header) into a {@link WaferMap}:
 * no-data value, scale and offset of integer samples, quantity, unit conversion to the quantity's unit (lifetimes to
 * µs), pixel grid, conditions and provenance. Precedence: sidecar over embedded metadata over header values over
 * assumptions; every assumption and conversion is recorded as a processing step.
 */
final class MapBuilder {
    /** Key of {@link MeasurementConditions#extra()} that holds the label of a page of a multi-page file. */
    static final String PAGE_LABEL = "page";

    private MapBuilder() {
    }

    /**
     * What a format reader found.
     *
     * @param samples        raw samples, row-major (integer samples as exact float values)
     * @param width          pixels per row
     * @param height         rows
     * @param integer        true for integer samples (scale/offset apply, counts by default)
     * @param embedded       metadata carried by the file itself, or null
     * @param headerPitchMm  pitch from format-specific header fields, or null
     * @param grid           a grid fixed by the reader (CSV point lists), or null
     * @param readSteps      steps describing the read (format, page, decoder, resampling)
     * @param inMicroseconds true when the reader already converted lifetimes to µs (CSV: from the decimal text)
     */
    record Raw(float[] samples, int width, int height, boolean integer, Sidecar embedded, Double headerPitchMm,
               PixelGrid grid, List<ProcessingStep> readSteps, boolean inMicroseconds) {
    }

    /**
     * The map of one page.
     *
     * @param name        the file as named by the user (messages)
     * @param source      the file name recorded as provenance source
     * @param stem        the file name without extension (default wafer id)
     * @param sidecar     the sidecar beside the file, or null
     * @param sidecarName the sidecar as named (messages, provenance)
     * @param page        0-based page index
     * @param pages       number of pages of the file
     */
    static WaferMap build(Raw raw, String name, String source, String stem, Sidecar sidecar, String sidecarName,
                          int page, int pages, ReadOptions options) throws MapFormatException {
        float[] s = raw.samples();
        Plan plan = plan(raw, name, source, stem, sidecar, sidecarName, page, pages, options);
        int noData = plan.countNoData(s, 0, s.length);
        plan = plan.withNoDataPixels(noData);
        plan.apply(s, 0, s.length, 0);
        MapHeader h = plan.header();
        return new WaferMap(FloatRaster.wrap(raw.width(), raw.height(), s), h.grid(), h.quantity(), h.waferId(),
                h.conditions(), h.provenance());
    }

    /**
     * What {@link #build} makes of a page, decided before its samples are seen: the header of the map and the
     * per-sample steps (no-data value to NaN, scale and offset of integer samples, unit conversion to µs). The no-data
     * step records how many pixels held the no-data value, so a plan with a no-data value needs that count
     * ({@link #countNoData}, then {@link #withNoDataPixels}) before its {@link #header()} is final.
     */
    static final class Plan {
        private final String name;
        private final int width;
        private final Float noData;
        private final String noDataText;
        private final DoubleUnaryOperator scale;
        private final String scaleWhat;
        private final DoubleUnaryOperator unit;
        private final String unitWhat;
        private final MapHeader before;
        private final List<ProcessingStep> after;
        private final int noDataPixels;

        private Plan(String name, int width, Float noData, String noDataText, DoubleUnaryOperator scale,
                     String scaleWhat, DoubleUnaryOperator unit, String unitWhat, MapHeader before,
                     List<ProcessingStep> after, int noDataPixels) {
            this.name = name;
            this.width = width;
            this.noData = noData;
            this.noDataText = noDataText;
            this.scale = scale;
            this.scaleWhat = scaleWhat;
            this.unit = unit;
            this.unitWhat = unitWhat;
            this.before = before;
            this.after = after;
            this.noDataPixels = noDataPixels;
        }

        /** True when the header records a count of no-data pixels (which {@link #withNoDataPixels} sets). */
        boolean countsNoData() {
            return noData != null;
        }

        /** The pixels among {@code s[from, to)} that hold the raw no-data value (0 without one). */
        int countNoData(float[] s, int from, int to) {
            if (noData == null) {
                return 0;
            }
            float nd = noData;
            int n = 0;
            for (int i = from; i < to; i++) {
                if (s[i] == nd) {
                    n++;
                }
            }
            return n;
        }

        /** This plan with the number of no-data pixels of the whole page. */
        Plan withNoDataPixels(int n) {
            return new Plan(name, width, noData, noDataText, scale, scaleWhat, unit, unitWhat, before, after, n);
        }

        /**
         * Applies the per-sample steps to {@code s[from, to)}, raw samples of the page from pixel
         * {@code firstPixel} on (row and column in messages).
         *
         * @throws MapFormatException when scaling or a unit conversion leaves the float range
         */
        void apply(float[] s, int from, int to, long firstPixel) throws MapFormatException {
            if (noData != null) {
                float nd = noData;
                for (int i = from; i < to; i++) {
                    if (s[i] == nd) {
                        s[i] = Float.NaN;
                    }
                }
            }
            if (scale != null) {
                transform(s, from, to, firstPixel, width, name, "scale", scaleWhat, scale);
            }
            if (unit != null) {
                transform(s, from, to, firstPixel, width, name, "unit", unitWhat, unit);
            }
        }

        /** The map's header (with the no-data count given to {@link #withNoDataPixels}). */
        MapHeader header() {
            if (noData == null) {
                return withSteps(after);
            }
            List<ProcessingStep> steps = new ArrayList<>();
            steps.add(ProcessingStep.of("no-data", "raw_value", noDataText, "pixels", Integer.toString(noDataPixels)));
            steps.addAll(after);
            return withSteps(steps);
        }

        private MapHeader withSteps(List<ProcessingStep> steps) {
            return new MapHeader(before.grid(), before.quantity(), before.waferId(), before.conditions(),
                    before.provenance().then(steps));
        }
    }

    /** The {@link Plan} of a page; {@code raw.samples()} is not used (it may be null). */
    static Plan plan(Raw raw, String name, String source, String stem, Sidecar sidecar, String sidecarName,
                     int page, int pages, ReadOptions options) throws MapFormatException {
        Sidecar embedded = raw.embedded() == null ? Sidecar.EMPTY : raw.embedded();
        Sidecar meta = sidecar == null ? embedded : embedded.overriddenBy(sidecar);
        List<ProcessingStep> steps = new ArrayList<>();
        Provenance base;
        if (embedded.history() != null) {
            base = embedded.history();
        } else {
            base = Provenance.of(source);
            steps.addAll(raw.readSteps());
        }
        if (sidecar != null) {
            steps.add(ProcessingStep.of("sidecar", "file", sidecarName));
            for (String w : sidecar.warnings()) {
                steps.add(ProcessingStep.of("warning", "file", sidecarName, "message", w));
            }
        }
        for (String w : embedded.warnings()) {
            steps.add(ProcessingStep.of("warning", "file", source, "message", w));
        }
        // the no-data step comes here, once its pixels are counted (Plan.header)
        List<ProcessingStep> after = new ArrayList<>();
        Float noData = meta.noData() == null ? null : (float) meta.noData().doubleValue();
        String noDataText = meta.noData() == null ? null : Sidecar.fmt(meta.noData());
        DoubleUnaryOperator scaleOp = null;
        String scaleWhat = null;
        boolean scaled = meta.scale() != null || meta.offset() != null;
        if (scaled && raw.integer()) {
            double scale = meta.scale() == null ? 1 : meta.scale();
            double offset = meta.offset() == null ? 0 : meta.offset();
            scaleOp = v -> offset + scale * v;
            scaleWhat = "scaling by " + scale + " and offset " + offset;
            after.add(ProcessingStep.of("scale", "scale", Double.toString(scale), "offset", Double.toString(offset)));
        } else if (scaled) {
            after.add(ProcessingStep.of("warning", "file", source, "message", "scale and offset apply to integer"
                    + " samples only; ignored for float samples"));
        }

        String unitOrigin = sidecar != null && sidecar.unit() != null ? sidecarName : name;
        Quantity quantity = meta.quantity();
        String unit = meta.unit() == null || (meta.unit().isBlank() && meta.quantity() == null) ? null : meta.unit();
        if (quantity == null && unit != null) {
            quantity = quantityOfUnit(unit, unitOrigin);
        }
        if (quantity == null) {
            if (raw.integer() && !scaled) {
                quantity = Quantity.PL_COUNTS;
                after.add(assume("quantity assumed: " + quantity.key() + " (integer samples without scale)"));
            } else {
                quantity = Quantity.EFFECTIVE_LIFETIME;
                after.add(assume("quantity assumed: " + quantity.key()));
            }
        }
        DoubleUnaryOperator unitOp = null;
        String unitWhat = null;
        if (isLifetime(quantity)) {
            if (unit == null) {
                after.add(assume("unit assumed: µs"));
            } else {
                LifetimeUnit lu;
                try {
                    lu = LifetimeUnit.parse(unit);
                } catch (IllegalArgumentException e) {
                    throw new MapFormatException(unitOrigin, "field 'unit'", "'" + unit + "' is not a lifetime unit,"
                            + " but the quantity is " + quantity.key() + " (expected s, ms, us/µs or ns)");
                }
                double factor = lu.toMicroseconds(1);
                if (factor != 1) {
                    if (!raw.inMicroseconds()) {
                        unitOp = v -> v * factor;
                        unitWhat = "converting " + lu.symbol() + " to µs";
                    }
                    after.add(ProcessingStep.of("convert-unit", "from", lu.symbol(), "to", "µs", "factor",
                            Sidecar.fmt(factor)));
                }
            }
        } else if (unit != null && !Sidecar.normaliseUnit(unit).equals(Sidecar.normaliseUnit(quantity.unit()))) {
            throw new MapFormatException(unitOrigin, "field 'unit'", "'" + unit + "' does not fit quantity "
                    + quantity.key() + " (expected " + (quantity.unit().isEmpty() ? "no unit" : "'"
                    + Sidecar.asciiUnit(quantity.unit()) + "'") + ")");
        }

        PixelGrid grid = raw.grid();
        if (grid == null) {
            Double pitch = meta.pixelPitchMm() != null ? meta.pixelPitchMm() : raw.headerPitchMm();
            if (pitch == null) {
                pitch = options.defaultPitchMm();
                after.add(assume("pixel pitch assumed: " + Sidecar.fmt(pitch) + " mm"));
            }
            double cx = meta.centreXPx() != null ? meta.centreXPx() : (raw.width() - 1) / 2.0;
            double cy = meta.centreYPx() != null ? meta.centreYPx() : (raw.height() - 1) / 2.0;
            grid = new PixelGrid(raw.width(), raw.height(), pitch, cx, cy);
        }

        MeasurementConditions conditions = meta.conditions();
        List<String> labels = meta.pages();
        if (labels != null) {
            if (labels.size() != pages) {
                String origin = sidecar != null && sidecar.pages() != null ? sidecarName : name;
                throw new MapFormatException(origin, "field 'pages'", "gives " + labels.size() + " label"
                        + (labels.size() == 1 ? "" : "s") + " but " + name + " has " + pages + " page"
                        + (pages == 1 ? "" : "s"));
            }
            Map<String, String> extra = new TreeMap<>(conditions.extra());
            extra.put(PAGE_LABEL, labels.get(page));
            conditions = Sidecar.withPage(conditions, meta.pageConditions().get(page)).overriddenBy(
                    new MeasurementConditions(null, null, null, null, null, null, null, null, extra));
        }
        String waferId = meta.waferId() != null ? meta.waferId() : stem;
        MapHeader before = new MapHeader(grid, quantity, waferId, conditions, base.then(steps));
        return new Plan(name, raw.width(), noData, noDataText, scaleOp, scaleWhat, unitOp, unitWhat, before,
                List.copyOf(after), 0);
    }

    static boolean isLifetime(Quantity q) {
        return q.unit().equals("µs");
    }

    private static Quantity quantityOfUnit(String unit, String origin) throws MapFormatException {
        try {
            LifetimeUnit.parse(unit);
            return Quantity.EFFECTIVE_LIFETIME;
        } catch (IllegalArgumentException e) {
            if (Sidecar.normaliseUnit(unit).equals("counts")) {
                return Quantity.PL_COUNTS;
            }
            throw new MapFormatException(origin, "field 'unit'", "unit '" + unit + "' alone does not say what the"
                    + " map holds; add field 'quantity' (e.g. trap-density)");
        }
    }

    private static ProcessingStep assume(String note) {
        return ProcessingStep.of("assume", "note", note);
    }

    /** Applies {@code f} to {@code s[from, to)} in place; a finite sample must stay within the float range. */
    private static void transform(float[] s, int from, int to, long firstPixel, int width, String name,
                                  String field, String what, DoubleUnaryOperator f) throws MapFormatException {
        for (int i = from; i < to; i++) {
            float before = s[i];
            s[i] = (float) f.applyAsDouble(before);
            if (Float.isInfinite(s[i]) && Float.isFinite(before)) {
                long pixel = firstPixel + (i - from);
                throw new MapFormatException(name, "row " + (pixel / width + 1) + ", column " + (pixel % width + 1),
                        what + " gives a value beyond the 32-bit float range; check field '" + field + "'");
            }
        }
    }
}
