package trapmap.viewer.graphics;

import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * The colours of a map whose values are categories (legend indices, statuses, region numbers): one colour and one
 * name per whole-number value, drawn by the map canvas and listed by its colour bar and by the tables that name the
 * same categories. No Swing.
 *
 * <p>Distinct categories take the colours of {@link #QUALITATIVE}, a qualitative palette: the seven colours of
 * Okabe &amp; Ito, "Color Universal Design (CUD): how to make figures and presentations that are friendly to
 * colorblind people" (2008; black left out), then the nine of P. Tol's "muted" scheme, "Colour schemes", SRON technical
 * note SRON/EPS/TN/09-002 (2021; its pale grey left out). More categories than colours repeat them, so every table
 * and colour bar also names each category by its number (never colour alone). The greys {@link #UNDECIDED_RGB} and
 * {@link #TOO_FEW_RGB} are kept for pixels that were ranked but name no single defect and for pixels with too few
 * usable levels; neither is a palette colour nor the canvas's dark no-data grey.
 *
 * @param entries the categories, each value once
 */
public record Categories(List<Category> entries) {
    /** The qualitative palette (0xRRGGBB): Okabe &amp; Ito (2008), then Tol (2021) "muted"; see the class comment. */
    public static final int[] QUALITATIVE = {
        0xE69F00, 0x56B4E9, 0x009E73, 0xF0E442, 0x0072B2, 0xD55E00, 0xCC79A7,
        0xCC6677, 0x332288, 0xDDCC77, 0x117733, 0x88CCEE, 0x882255, 0x44AA99, 0x999933, 0xAA4499,
    };
    /** Light grey: ranked, but no single defect explains the curve. */
    public static final int UNDECIDED_RGB = 0xB4B4B4;
    /** Pale grey: too few usable levels to rank. */
    public static final int TOO_FEW_RGB = 0xE6E6E6;
    /**
     * Colour of a finite value between categories, e.g. the mean of a block mixing several (a light violet). The
     * canvas shows a zoomed-out map of a categorical quantity by each block's most common code, so such a map never
     * shows it.
     */
    public static final int MIXED_RGB = 0xD8C8E8;
    /** How far from a whole number a value may lie and still be that category. */
    static final double TOLERANCE = 1e-3;

    /** One category: the map value, its name and its colour (0xRRGGBB). */
    public record Category(int value, String label, int rgb) {
    }

    /** Checks that no value is listed twice. */
    public Categories {
        entries = List.copyOf(entries);
        Map<Integer, Category> seen = new HashMap<>();
        for (Category c : entries) {
            if (seen.put(c.value(), c) != null) {
                throw new IllegalArgumentException("category value " + c.value() + " is listed twice");
            }
        }
    }

    /** Colour {@code k} (0-based) of {@link #QUALITATIVE}, repeating after the last. */
    public static int qualitative(int k) {
        return QUALITATIVE[Math.floorMod(k, QUALITATIVE.length)];
    }

    /** The category of value {@code v} (a whole number within {@value #TOLERANCE}); null for NaN or none. */
    public Category of(double v) {
        if (!Double.isFinite(v)) {
            return null;
        }
        long k = Math.round(v);
        if (Math.abs(v - k) > TOLERANCE) {
            return null;
        }
        for (Category c : entries) {
            if (c.value() == k) {
                return c;
            }
        }
        return null;
    }

    /**
     * The colour of value {@code v}: its category's; {@link #MIXED_RGB} for a finite value between categories (the
     * mean of a block mixing several, when zoomed out); {@code noData} for NaN and whole numbers that are no category.
     */
    public int rgb(double v, int noData) {
        Category c = of(v);
        if (c != null) {
            return c.rgb();
        }
        return Double.isFinite(v) && Math.abs(v - Math.round(v)) > TOLERANCE ? MIXED_RGB : noData;
    }
}
