package trapmap.maps.io;

import java.util.regex.Pattern;

/**
 * Text cells of the CSV files trapmap writes, made safe to open in a spreadsheet: a cell that starts with
 * {@code =}, {@code +}, {@code -}, {@code @}, a tab or a carriage return could be taken for a formula (and a formula
 * can run a command or send data away), so such a cell is written with a single quote in front, as the OWASP
 * "CSV Injection" guidance advises (owasp.org/www-community/attacks/CSV_Injection). A number such as {@code -1.5} or
 * {@code -2.5E-4} stays as it is. A cell that itself starts with a single quote gets one more, so that
 * {@link #raw} gives back exactly what was written: every reader of trapmap's own CSV files (resuming a batch, the
 * batch report) reads its cells through {@link #raw}. JSON outputs keep the raw values.
 */
public final class CsvCells {
    private static final Pattern NUMBER = Pattern.compile(
            "[+-]?(?:\\d+(?:\\.\\d*)?|\\.\\d+)(?:[eE][+-]?\\d+)?|[+-]?Infinity|NaN");

    private CsvCells() {
    }

    /** The cell as written: {@code text} with a single quote in front when a spreadsheet could run it. */
    public static String text(String text) {
        if (text == null || text.isEmpty()) {
            return text;
        }
        char c = text.charAt(0);
        boolean risky = c == '=' || c == '+' || c == '-' || c == '@' || c == '\t' || c == '\r' || c == '\'';
        if (!risky || (c != '\'' && NUMBER.matcher(text).matches())) {
            return text;
        }
        return "'" + text;
    }

    /**
     * Any cell value: texts as {@link #text}, doubles and floats as {@link NumberText#of} writes them (non-finite as
     * the empty cell), other values unchanged.
     */
    public static Object cell(Object value) {
        if (value instanceof Double d) {
            return NumberText.of(d);
        }
        if (value instanceof Float f) {
            return NumberText.of(f);
        }
        return value instanceof CharSequence s ? text(s.toString()) : value;
    }

    /** The text a cell written by {@link #text} stands for: one leading single quote removed. */
    public static String raw(String cell) {
        return cell != null && cell.startsWith("'") ? cell.substring(1) : cell;
    }
}
