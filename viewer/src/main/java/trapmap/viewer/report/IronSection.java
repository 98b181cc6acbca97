package trapmap.viewer.report;

import java.io.IOException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import trapmap.maps.batch.IronPairRules;
import trapmap.maps.batch.IronPairs;
import trapmap.viewer.graphics.Labels;

/**
 * The interstitial iron of the wafers measured as FeB-dissociation pairs: one row per pair (the FeB-state map's
 * results row) with its maps, iron status, the iron figures of {@code results.csv} (median and percentiles, cm⁻³;
 * those outside their limits marked) and the notes. Drawn only when the batch has such pairs.
 */
final class IronSection {
    static final String TITLE = "Interstitial iron (FeB pairs)";

    private IronSection() {
    }

    /** The rows that carry a pair's iron figures, in the results' order. */
    static List<BatchContent.Row> pairs(BatchContent c) {
        return c.rows().stream().filter(BatchContent.Row::ironPair).toList();
    }

    static void draw(ReportFlow flow, BatchContent c) throws IOException {
        List<BatchContent.Row> pairs = pairs(c);
        if (pairs.isEmpty()) {
            return;
        }
        Set<String> figureSet = new LinkedHashSet<>();
        pairs.forEach(r -> r.iron().keySet().stream().filter(k -> !Double.isNaN(IronPairRules.percentOf(k)))
                .forEach(figureSet::add));
        List<String> figures = new ArrayList<>(figureSet);
        figures.sort(Comparator.comparingDouble(IronPairRules::percentOf));
        float f = ReportFlow.FULL;
        float fig = f * 0.11f;
        float[] widths = new float[4 + figures.size()];
        boolean[] right = new boolean[widths.length];
        String[] header = new String[widths.length];
        widths[0] = f * 0.14f;
        widths[1] = f * 0.27f;
        widths[2] = f * 0.08f;
        header[0] = "wafer";
        header[1] = "maps (FeB state / Fe_i state)";
        header[2] = "iron status";
        for (int k = 0; k < figures.size(); k++) {
            widths[3 + k] = fig;
            right[3 + k] = true;
            header[3 + k] = what(figures.get(k)) + " (" + Typeset.PER_CM3 + ")";
        }
        float used = 0;
        for (int k = 0; k < widths.length - 1; k++) {
            used += widths[k];
        }
        widths[widths.length - 1] = Math.max(f * 0.12f, f - used);
        header[widths.length - 1] = "note";
        List<String[]> rows = new ArrayList<>();
        for (BatchContent.Row r : pairs) {
            String[] row = new String[widths.length];
            row[0] = r.name();
            row[1] = fileName(r.file()) + " / " + fileName(r.iron().getOrDefault(IronPairs.PARTNER, ""));
            row[2] = r.iron().getOrDefault(IronPairs.STATUS, "");
            List<String> failed = Arrays.asList(r.iron().getOrDefault(IronPairs.FAILED, "").split(";"));
            for (int k = 0; k < figures.size(); k++) {
                String text = r.iron().getOrDefault(figures.get(k), "");
                row[3 + k] = text.isEmpty() ? "" : Labels.number(number(text))
                        + (failed.contains(figures.get(k)) ? " (fails)" : "");
            }
            row[widths.length - 1] = r.iron().getOrDefault(IronPairs.NOTE, "");
            rows.add(row);
        }
        String lead = "Interstitial iron [Fe_i] of the " + (pairs.size() == 1 ? "wafer" : pairs.size() + " wafers")
                + " measured as an FeB-dissociation pair: the iron map from the FeB-state and Fe_i-state lifetime"
                + " maps of one wafer (Macdonald, Geerligs & Azzizi, J. Appl. Phys. 95, 1021 (2004)); median and"
                + " percentiles over the pixels with an iron value, in " + Typeset.PER_CM3 + ", as results.csv gives"
                + " them (iron_median_cm3, iron_pNN_cm3). A figure outside the rules' iron limits, or a pair in"
                + " error, fails the wafer.";
        float size = 8;
        float keep = flow.paragraphHeight(lead, PdfPage.REGULAR, 8.5f) + ReportFlow.tableHeight(widths, header, rows, size);
        flow.section(TITLE, keep <= flow.pageRoom() ? keep : 120);
        flow.paragraph(lead, PdfPage.REGULAR, 8.5f);
        flow.table(widths, right, header, rows, size);
    }

    /** "median", "P95" of an iron figure column. */
    private static String what(String column) {
        if (column.equals("iron_median_cm3")) {
            return "median";
        }
        return "P" + column.substring("iron_p".length(), column.length() - "_cm3".length());
    }

    private static String fileName(String file) {
        if (file.isEmpty()) {
            return "(none)";
        }
        int slash = Math.max(file.lastIndexOf('/'), file.lastIndexOf('\\'));
        return file.substring(slash + 1);
    }

    private static double number(String s) {
        try {
            return Double.parseDouble(s);
        } catch (NumberFormatException e) {
            return Double.NaN;
        }
    }
}
