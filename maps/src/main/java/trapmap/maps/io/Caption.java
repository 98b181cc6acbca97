package trapmap.maps.io;

import java.util.ArrayList;
import java.util.List;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;

/**
 * What the caption strip of an exported map picture says: the wafer id, the quantity with its unit, the defect it was
 * converted with and a date. Every part is optional (null or blank: left out).
 *
 * @param waferId  the wafer's id or name
 * @param quantity the quantity's key, e.g. {@code trap-density}
 * @param unit     the quantity's unit, e.g. {@code cm^-3}; blank for unitless quantities
 * @param defect   the defect id the map was converted with
 * @param date     a date, e.g. {@code 2026-12-04} (left out of pictures that must stay byte-stable)
 */
public record Caption(String waferId, String quantity, String unit, String defect, String date) {
    /** Separator between the parts of the caption. */
    static final String SEPARATOR = "  ·  ";

    /**
     * The caption of {@code map}: its wafer id, quantity and unit, and the defect of the last conversion step of its
     * history (none when it was never converted); no date.
     */
    public static Caption of(WaferMap map) {
        String defect = null;
        ProcessingStep compared = null;
        for (ProcessingStep s : map.provenance().steps()) {
            if (s.operation().equals("convert") && s.parameters().containsKey("defect")) {
                defect = s.parameters().get("defect");
            }
            if (s.operation().equals("compare") && s.parameters().containsKey("result")) {
                compared = s;
            }
        }
        String quantity = map.quantity().key();
        String unit = map.quantity().unit();
        if (compared != null && COMPARED.contains(map.quantity())) {
            // what the comparison made (a reduction is stored as a fraction) and, for a difference, the maps' unit
            quantity = compared.parameters().get("result");
            unit = compared.parameters().getOrDefault("unit", unit);
        }
        return new Caption(map.waferId(), quantity, unit, defect, null);
    }

    /** The quantities a comparison of two maps gives. */
    private static final java.util.Set<Quantity> COMPARED = java.util.EnumSet.of(Quantity.DIFFERENCE, Quantity.RATIO,
            Quantity.RELATIVE_CHANGE, Quantity.FRACTION);

    public Caption withDefect(String id) {
        return new Caption(waferId, quantity, unit, id, date);
    }

    public Caption withDate(String d) {
        return new Caption(waferId, quantity, unit, defect, d);
    }

    /** The quantity with its unit, e.g. {@code trap-density (cm^-3)}; empty when there is no quantity. */
    public String quantityWithUnit() {
        if (blank(quantity)) {
            return "";
        }
        return quantity + (blank(unit) ? "" : " (" + unit + ")");
    }

    /** The full caption, e.g. {@code wafer W-07  ·  trap-density (cm^-3)  ·  defect fe-i  ·  2026-12-04}. */
    public String text() {
        List<String> parts = new ArrayList<>();
        if (!blank(waferId)) {
            parts.add("wafer " + waferId.strip());
        }
        if (!blank(quantity)) {
            parts.add(quantityWithUnit());
        }
        if (!blank(defect)) {
            parts.add("defect " + defect.strip());
        }
        if (!blank(date)) {
            parts.add(date.strip());
        }
        return String.join(SEPARATOR, parts);
    }

    /** The short caption of a thumbnail: wafer id and quantity with unit. */
    public String shortText() {
        List<String> parts = new ArrayList<>();
        if (!blank(waferId)) {
            parts.add(waferId.strip());
        }
        if (!blank(quantity)) {
            parts.add(quantityWithUnit());
        }
        return String.join(SEPARATOR, parts);
    }

    private static boolean blank(String s) {
        return s == null || s.isBlank();
    }
}
