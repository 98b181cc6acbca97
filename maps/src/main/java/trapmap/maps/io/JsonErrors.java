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
        return where + "not valid JSON: " + e.getOriginalMessage();
    }
}
