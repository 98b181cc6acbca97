package trapmap.maps.io;

import static trapmap.maps.io.CsvNumbers.isNumberOrNaN;

import java.util.regex.Pattern;

/**
 * Which CSV layout the first data line shows: its delimiter (semicolon, comma, tab, else runs of blanks) and whether
 * it is a header of names (a point list) or a row of numbers (a grid). Quotes around single fields are removed.
 */
final class CsvLayout {
    private CsvLayout() {
    }

    /** The delimiter of a line: {@code ;} before {@code ,} before tab; {@code ' '} for runs of blanks. */
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

    static String unquote(String s) {
        return s.length() >= 2 && s.startsWith("\"") && s.endsWith("\"") ? s.substring(1, s.length() - 1) : s;
    }

    /** True when the first data line {@code line} names columns (a point list) rather than holding numbers. */
    static boolean isPointList(String line) {
        char delimiter = delimiter(line);
        return isHeader(split(line, delimiter), delimiter);
    }
}
