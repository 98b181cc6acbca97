package trapmap.maps.batch;

/**
 * A rules file that cannot be used; the one-line message names the file, the field and its unit (a line break that a
 * key or value of the file brings in is shown as {@code \n} or {@code \r}).
 */
public class RulesException extends Exception {
    private static final long serialVersionUID = 1L;

    public RulesException(String message) {
        super(message.replace("\r", "\\r").replace("\n", "\\n"));
    }
}
