package trapmap.maps.io;

import trapmap.shared.units.Units;

import java.io.IOException;

/**
 * A map file that cannot be read: missing, truncated, malformed, of an unsupported kind, or larger than the limits of
 * {@link ReadOptions}. The message is one line that names the file, where in it the problem is (line, field, tag,
 * page or byte offset) and, for values, the unit they are expected in, e.g.
 * {@code wafer07.csv: line 12: value 'abc' is not a number (µs)}. Every failure of {@link MapFiles}' readers surfaces
 * as this exception; the cause, when there is one, keeps the low-level detail for logs.
 */
public class MapFormatException extends IOException {
    private static final long serialVersionUID = 1L;

    /** The file as the user named it. */
    private final String file;
    /** Where in the file: {@code line 12}, {@code field 'conditions.doping'}, {@code page 2, tag 257 ...}; or null. */
    private final String location;
    /** What is wrong, without file and location. */
    private final String problem;
    /** The unit the offending value is expected in; empty when dimensionless or not about a value. */
    private final String unit;

    public MapFormatException(String file, String location, String problem, String unit, Throwable cause) {
        super(compose(file, location, problem, unit), cause);
        this.file = file;
        this.location = location == null || location.isEmpty() ? null : location;
        this.problem = oneLine(problem);
        this.unit = unit == null ? "" : unit;
    }

    public MapFormatException(String file, String location, String problem, String unit) {
        this(file, location, problem, unit, null);
    }

    public MapFormatException(String file, String location, String problem) {
        this(file, location, problem, "", null);
    }

    /** The file as the user named it. */
    public String file() {
        return file;
    }

    /** Where in the file the problem is, or null when it concerns the whole file. */
    public String location() {
        return location;
    }

    /** What is wrong, without file name and location. */
    public String problem() {
        return problem;
    }

    /** The unit the offending value is expected in; empty when there is none. */
    public String unit() {
        return unit;
    }

    private static String compose(String file, String location, String problem, String unit) {
        StringBuilder s = new StringBuilder(String.valueOf(file));
        if (location != null && !location.isEmpty()) {
            s.append(": ").append(oneLine(location));
        }
        s.append(": ").append(oneLine(problem));
        // the unit is appended unless the problem already states it (as the doping parser's messages do)
        String label = Units.label(unit);
        if (!label.isEmpty() && !String.valueOf(problem).contains(" " + unit)
                && !String.valueOf(problem).contains(" " + label)) {
            s.append(" (").append(label).append(')');
        }
        return s.toString();
    }

    static String oneLine(String s) {
        return s == null ? "" : s.replaceAll("\\s*\\R\\s*", " ").trim();
    }
}
