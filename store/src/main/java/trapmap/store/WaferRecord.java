package trapmap.store;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.TreeMap;
import java.util.regex.Pattern;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.Footprint;
import trapmap.maps.batch.LotPattern;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.io.Sidecar;

/**
 * What the store keeps of one inspected wafer: its result, the SHA-256 of the map file's content, and the facts of
 * its sidecar's conditions ({@code lot}, {@code measured_at}, {@code furnace_tube}, {@code boat_slot}, ...).
 *
 * @param result        the inspection's result
 * @param contentSha256 SHA-256 of the map file's bytes (lower-case hex); "" when the file could not be read
 * @param attributes    the sidecar's condition facts by name, as text (empty without a readable sidecar)
 * @param lot           the {@value #LOT} fact, else the first group of the rules' lot pattern in the wafer id
 *                      ({@link LotPattern}), else null
 * @param measuredAt    the {@value #MEASURED_AT} fact (ISO-8601 with an offset or Z), else null (never invented)
 * @param warnings      facts that could not be used, one line each naming the file and the field
 */
public record WaferRecord(WaferResult result, String contentSha256, Map<String, String> attributes, String lot,
                          Instant measuredAt, List<String> warnings) {
    /** The fact holding the wafer's lot. */
    public static final String LOT = "lot";
    /** The fact holding the time the wafer was measured, ISO-8601 UTC, e.g. {@code 2026-11-02T08:15:00Z}. */
    public static final String MEASURED_AT = "measured_at";

    public WaferRecord {
        Objects.requireNonNull(result, "result");
        contentSha256 = Objects.requireNonNullElse(contentSha256, "");
        attributes = Map.copyOf(attributes);
        warnings = List.copyOf(warnings);
    }

    /**
     * The record of {@code result}: reads the map file (for its SHA-256) and its sidecar ({@link MapFiles#sidecarOf})
     * for the facts; {@code lotPattern} (null for none) gives the lot when there is no {@code lot} fact.
     */
    public static WaferRecord of(WaferResult result, Pattern lotPattern) {
        Path file = Path.of(result.file());
        String sha = "";
        try {
            sha = sha256(file);
        } catch (IOException | RuntimeException e) {
            // an error result for a missing or unreadable file: kept under its file name (see ResultsStore.resultKey)
        }
        Map<String, String> facts = new TreeMap<>();
        Path sidecar = MapFiles.sidecarOf(file);
        if (!sidecar.equals(file) && Files.isRegularFile(sidecar)) {
            try {
                facts.putAll(Sidecar.read(sidecar).conditions().extra());
            } catch (MapFormatException | RuntimeException e) {
                // the inspection told the sidecar's problem in the wafer's error; no facts are kept
            }
        }
        List<String> warnings = new ArrayList<>();
        String lot = facts.get(LOT);
        if (lot == null || lot.isBlank()) {
            lot = LotPattern.lotOf(lotPattern, result.waferId());
        }
        Instant measured = null;
        String at = facts.get(MEASURED_AT);
        if (at != null) {
            try {
                measured = parseTime(at);
            } catch (DateTimeParseException e) {
                warnings.add(sidecar + ": field 'conditions." + MEASURED_AT + "': not an ISO-8601 time with an offset"
                        + " (e.g. 2026-11-02T08:15:00Z) but '" + at + "'; the wafer is stored without a measured time");
            }
        }
        return new WaferRecord(result, sha, facts, lot, measured, warnings);
    }

    /** An ISO-8601 time with a zone offset or Z, e.g. {@code 2026-11-02T08:15:00Z} or {@code ...T09:15:00+01:00}. */
    public static Instant parseTime(String text) {
        return OffsetDateTime.parse(text.trim()).toInstant();
    }

    /** SHA-256 of a file's bytes, lower-case hex. */
    public static String sha256(Path file) throws IOException {
        MessageDigest d = digest();
        byte[] buf = new byte[1 << 16];
        try (InputStream in = Files.newInputStream(file)) {
            for (int n; (n = in.read(buf)) > 0; ) {
                d.update(buf, 0, n);
            }
        }
        return HexFormat.of().formatHex(d.digest());
    }

    /** SHA-256 of a text's UTF-8 bytes, lower-case hex. */
    public static String sha256(String text) {
        return HexFormat.of().formatHex(digest().digest(text.getBytes(StandardCharsets.UTF_8)));
    }

    private static MessageDigest digest() {
        try {
            return MessageDigest.getInstance("SHA-256");
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("SHA-256 is missing from this Java runtime", e);
        }
    }

    /** The regions' rows as in regions.csv. */
    List<Map<String, String>> regionRows() {
        return BatchInspection.regionRows(result);
    }

    /** The footprint, or null. */
    Footprint footprint() {
        return result.footprint();
    }
}
