package trapmap.shared.text;

import trapmap.shared.error.InvalidValueException;

/**
 * The lengths and counts of text that trapmap accepts from a file: every reader (sidecars, CSV headers, TIFF
 * descriptions, rules, defect files, sessions) checks its texts against these limits, so that an overlong value is
 * refused with one message naming the file, the field and the limit instead of slowing every later step down.
 * The README lists them.
 */
public final class TextLimits {
    /** Longest identifier or name: wafer ids, profile names, defect ids and names, keys, characters. */
    public static final int MAX_ID_CHARS = 256;
    /** Longest other text value (free-text facts, notes, paths, history parameters), characters. */
    public static final int MAX_TEXT_CHARS = 4096;
    /** Longest file-name glob (rules profiles and iron pairs), characters. */
    public static final int MAX_GLOB_CHARS = 1024;
    /** Most keys (fields of all objects together) in one sidecar or embedded description. */
    public static final int MAX_KEYS = 10_000;
    /** Most warnings of one kind listed one by one; the rest are summed up in one line. */
    public static final int MAX_LISTED_WARNINGS = 20;

    private TextLimits() {
    }

    /**
     * Null when {@code text} (null allowed) has at most {@code maxChars} characters, else the problem, e.g.
     * {@code "is 50000 characters long; at most 256 are allowed"}.
     */
    public static String problem(String text, int maxChars) {
        if (text == null || text.length() <= maxChars) {
            return null;
        }
        return "is " + text.length() + " characters long; at most " + maxChars + " are allowed";
    }

    /**
     * {@code text} itself when it has at most {@code maxChars} characters.
     *
     * @param field the field as the file names it, e.g. {@code wafer_id}
     * @throws InvalidValueException naming the field and the limit (unit: characters) when it is longer
     */
    public static String check(String text, int maxChars, String field) {
        String p = problem(text, maxChars);
        if (p != null) {
            throw new InvalidValueException(field, "characters", field + " " + p);
        }
        return text;
    }

    /** An identifier (at most {@link #MAX_ID_CHARS}) as {@link #check}. */
    public static String id(String text, String field) {
        return check(text, MAX_ID_CHARS, field);
    }

    /** Other text (at most {@link #MAX_TEXT_CHARS}) as {@link #check}. */
    public static String text(String text, String field) {
        return check(text, MAX_TEXT_CHARS, field);
    }

    /** The line that stands for the {@code more} warnings not listed, e.g. "… and 499980 more unknown fields". */
    public static String andMore(int more, String what) {
        return "... and " + more + " more " + what;
    }
}
