package trapmap.viewer.report;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import trapmap.maps.batch.HotSpots;
import trapmap.maps.batch.Recurrence;
import trapmap.maps.batch.RecurrencePicture;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PitchPrecision;
import trapmap.maps.region.Region;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.graphics.Labels;

/**
 * One page per wafer family: the share of its wafers flagged at each cell on a fixed 0–100 % scale with a colour
 * bar, the hot spots ({@link HotSpots}, the maps module's rule, the same the batch's recurrence pictures show)
 * outlined, and a table of the largest; a family too small to judge says so.
 */
final class RecurrenceSection {
    /** Hot spots listed in the table. */
    static final int LISTED = 10;
    private static final float SIZE = 330;

    private RecurrenceSection() {
    }

    static void drawAll(ReportFlow flow, BatchContent c) throws IOException {
        for (Map.Entry<String, Recurrence> e : c.recurrence().entrySet()) {
            draw(flow, c.hotSpots(), e.getValue());
        }
        for (String leftOut : c.recurrenceLeftOut()) {
            flow.paragraph("Not in the recurrence maps: " + leftOut + ".", PdfPage.REGULAR, 8.5f);
        }
    }

    static void draw(ReportFlow flow, HotSpots.Criteria criteria, Recurrence r) throws IOException {
        HotSpots.Result hot = HotSpots.find(r, criteria);
        WaferMap m = r.fraction();
        flow.part("Recurrence: " + r.family() + " (" + r.wafers() + " wafer" + (r.wafers() == 1 ? "" : "s") + ")");
        flow.paragraph("Share of the " + r.wafers() + " wafer" + (r.wafers() == 1 ? "" : "s") + " of this family"
                + " with a flagged region at each " + Labels.number(m.grid().pitchMm()) + " mm cell, over the wafers"
                + " evaluated there (wafer coordinates; fixed scale 0 to 100 %; grey: no wafer covers the cell)."
                + " Hot spots, outlined in magenta: cells flagged on more than " + Labels.percent(criteria.share())
                + " of their wafers and covered by at least " + hot.wafersNeeded() + " wafers (at least "
                + criteria.minWafers() + " and " + Labels.percent(criteria.minFamilyShare()) + " of the family).",
                PdfPage.REGULAR, 8.5f);
        if (hot.tooFewWafers()) {
            flow.paragraph("Too few wafers: this family has " + r.wafers() + " wafer" + (r.wafers() == 1 ? "" : "s")
                    + ", fewer than the " + hot.wafersNeeded() + " a cell needs, so no cell is judged a hot spot;"
                    + " the map only shows where " + (r.wafers() == 1 ? "its wafer was" : "its wafers were")
                    + " flagged.", PdfPage.BOLD, 8.5f);
        }
        float[] pct = m.raster().samples().clone();
        for (int i = 0; i < pct.length; i++) {
            pct[i] *= 100;
        }
        WaferMap percent = new WaferMap(FloatRaster.wrap(m.width(), m.height(), pct), m.grid(), m.quantity(),
                m.waferId(), m.conditions(), m.provenance());
        DisplayStyle style = new DisplayStyle(RecurrencePicture.COLOURS, false, 0, 100);
        flow.need(SIZE + 8);
        flow.image(MapPicture.render(percent, style, hot.cells(), null, 0, (int) (SIZE * BatchReport.SCALE)),
                ReportFlow.LEFT, SIZE, SIZE);
        flow.image(MapPicture.colourBarImage(style, RecurrencePicture.BAR_LABEL, 70, (int) SIZE, BatchReport.SCALE),
                ReportFlow.LEFT + SIZE + 6, 70, SIZE);
        flow.down(SIZE + 12);
        flow.heading("Hot spots", 30);
        int n = hot.regions().size();
        String sum = n == 0 ? "No hot spot." : n + " hot spot" + (n == 1 ? "" : "s") + ", "
                + PitchPrecision.areaMm2(hot.regions().totalAreaMm2(), percent.grid().pitchMm()) + " " + Typeset.MM2
                + " in all.";
        if (hot.thinCells() > 0) {
            sum += " " + hot.thinCells() + " cell" + (hot.thinCells() == 1 ? " was" : "s were") + " flagged on more"
                    + " than " + Labels.percent(criteria.share()) + " of fewer than " + hot.wafersNeeded() + " wafers"
                    + " and " + (hot.thinCells() == 1 ? "is" : "are") + " not counted.";
        }
        if (n > LISTED) {
            sum += " The largest, showing " + LISTED + " of " + n + ":";
        }
        flow.paragraph(sum, PdfPage.REGULAR, 8.5f);
        if (n > 0) {
            List<String[]> rows = new ArrayList<>();
            double pitch = percent.grid().pitchMm();
            for (Region reg : hot.regions().byArea().subList(0, Math.min(LISTED, n))) {
                rows.add(new String[] {"#" + reg.id(), PitchPrecision.areaMm2(reg.areaMm2(), pitch),
                    PitchPrecision.mm(reg.centroidXMm(), pitch), PitchPrecision.mm(reg.centroidYMm(), pitch),
                    Labels.percent(reg.peakValue()),
                    Labels.percent(reg.meanValue())});
            }
            float cw = ReportFlow.FULL / 6;
            flow.table(new float[] {cw, cw, cw, cw, cw, cw}, new boolean[] {false, true, true, true, true, true},
                    new String[] {"hot spot", Typeset.headed("area", Typeset.MM2), "centre x (mm)", "centre y (mm)",
                        "highest share",
                        "mean share"}, rows, 8);
        }
    }
}
