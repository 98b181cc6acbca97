package trapmap.cli;

/**
 * Input the command cannot work with: a missing or contradictory option, an unknown defect, an unreadable input
 * file. The message is one line written in terms of the command-line flags (e.g. {@code --srv needs
 * --thickness-um ...}); {@link #forColumns(String)} rewrites it for a cases file, where the flags are columns.
 */
final class InputException extends RuntimeException {
    private static final long serialVersionUID = 1L;

    InputException(String message) {
        super(message);
    }

    InputException(String message, Throwable cause) {
        super(message, cause);
    }

    /** {@code message} with every flag {@code --thickness-um} written as its column name {@code thickness_um}. */
    static String forColumns(String message) {
        java.util.regex.Matcher m = java.util.regex.Pattern.compile("(?<![\\w-])--([a-z][a-z0-9-]*)").matcher(message);
        StringBuilder sb = new StringBuilder();
        while (m.find()) {
            m.appendReplacement(sb, m.group(1).replace('-', '_'));
        }
        m.appendTail(sb);
        return sb.toString();
    }
}
