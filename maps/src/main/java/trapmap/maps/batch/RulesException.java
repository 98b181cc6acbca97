package trapmap.maps.batch;

/** A rules file that cannot be used; the one-line message names the file, the field and its unit. */
public class RulesException extends Exception {
    private static final long serialVersionUID = 1L;

    public RulesException(String message) {
        super(message);
    }
}
