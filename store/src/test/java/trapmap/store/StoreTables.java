package trapmap.store;

import java.sql.ResultSet;
import java.sql.ResultSetMetaData;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * The rows of a store's seven wafer tables as text, for comparing two stores (SQLite or PostgreSQL) row for row; shared
 * with other modules' tests through this module's test jar.
 */
public final class StoreTables {
    /** The tables a wafer's rows lie in. */
    public static final List<String> TABLES = List.of("wafers", "wafer_figures", "wafer_failed_rules",
            "wafer_attributes", "wafer_regions", "wafer_footprints", "footprint_cells");

    private StoreTables() {
    }

    /**
     * Every row of each of {@link #TABLES}, as {@code column=value} text without the columns {@code except}
     * (lower-case names), sorted; numbers written alike from both databases (integers as integers, the others as
     * {@link Double#toString}), NULL as {@code null}.
     */
    public static Map<String, List<String>> rows(ResultsStore store, Set<String> except) throws SQLException {
        Map<String, List<String>> out = new LinkedHashMap<>();
        for (String table : TABLES) {
            List<String> rows = new ArrayList<>();
            try (Statement s = store.connection().createStatement();
                 ResultSet r = s.executeQuery("SELECT * FROM " + table)) {
                ResultSetMetaData m = r.getMetaData();
                while (r.next()) {
                    StringBuilder b = new StringBuilder();
                    for (int i = 1; i <= m.getColumnCount(); i++) {
                        String column = m.getColumnName(i).toLowerCase(Locale.ROOT);
                        if (!except.contains(column)) {
                            b.append(column).append('=').append(text(r.getObject(i))).append(' ');
                        }
                    }
                    rows.add(b.toString());
                }
            }
            rows.sort(null);
            out.put(table, rows);
        }
        return out;
    }

    private static String text(Object v) {
        if (v instanceof Double || v instanceof Float) {
            return Double.toString(((Number) v).doubleValue());
        }
        if (v instanceof Number n) {
            return Long.toString(n.longValue());
        }
        return String.valueOf(v);
    }
}
