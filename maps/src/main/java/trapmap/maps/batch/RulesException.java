package trapmap.maps.batch;

import trapmap.shared.units.Units;

/**
 * A rules file that cannot be used; the one-line message names the file, the field and its unit (a line break that a
 * key or value of the file brings in is shown as {@code \n} or {@code \r}).
 */
public class RulesException extends Exception {
    private static final long serialVersionUID = 1L;

    public RulesException(String message) {
        super(message.replace("\r", "\\r").replace("\n", "\\n"));
    }

    /**
     * The refusal of one field: {@code NAME: field 'FIELD': PROBLEM (UNIT)}, the unit shown as {@link Units#label} writes it, left out when empty.
     *
     * @param name  the rules file's name
     * @param field the field's path, e.g. {@code profiles[0].stack.noise}
     */
    static RulesException field(String name, String field, String problem, String unit) {
        return new RulesException(name + ": field '" + field + "': " + problem
                + (unit.isEmpty() ? "" : " (" + Units.label(unit) + ")"));
    }
}
