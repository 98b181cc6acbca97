package trapmap.maps.io;

import com.fasterxml.jackson.core.JsonProcessingException;

/** Messages for JSON texts that cannot be read (rules files, physics settings files). */
public final class JsonErrors {
    private JsonErrors() {
    }

    /**
     * Where and why a JSON text could not be read, for a message after the file name: {@code line 3, column 7: not
     * valid JSON: …} (without a place when the parser gives none).
     */
    public static String notJson(JsonProcessingException e) {
        String where = e.getLocation() == null ? "" : "line " + e.getLocation().getLineNr() + ", column "
                + e.getLocation().getColumnNr() + ": ";
        return where + "not valid JSON: " + reason(e);
    }

    /**
     * The parser's reason, with its advice to the programmer (which parser feature to enable) turned into what the
     * writer of the file needs: JSON has no NaN or Infinity, and no comments.
     */
    public static String reason(JsonProcessingException e) {
        String m = e.getOriginalMessage() == null ? String.valueOf(e.getMessage()) : e.getOriginalMessage();
        java.util.regex.Matcher nonNumber = NON_NUMBER.matcher(m);
        if (nonNumber.find()) {
            return "'" + nonNumber.group(1) + "' is not a number in JSON (JSON has no NaN or Infinity: give a number,"
                    + " or leave the field out where it is optional)";
        }
        if (m.contains("'ALLOW_COMMENTS' not enabled")) {
            return m.replaceFirst("\\s*\\(not recognized as one since Feature 'ALLOW_COMMENTS' not enabled for"
                    + " parser\\)", "") + " JSON has no comments";
        }
        return m;
    }

    private static final java.util.regex.Pattern NON_NUMBER = java.util.regex.Pattern.compile(
            "^Non-standard token '([^']*)': enable `?[A-Za-z.]*ALLOW_NON_NUMERIC_NUMBERS`? to allow");
}
