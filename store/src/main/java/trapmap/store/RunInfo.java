package trapmap.store;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.time.Instant;
import java.util.Objects;
import trapmap.maps.batch.RunManifest;
import trapmap.maps.io.PhysicsSettingsFile;
import trapmap.physics.conversion.PhysicsSettings;

/**
 * One inspection run as the store records it.
 *
 * @param startedAt      when the run started (UTC)
 * @param rulesFile      the rules file as given
 * @param rulesSha256    SHA-256 of the rules file's content, lower-case hex
 * @param settingsJson   the physics settings in effect, as compact JSON
 * @param settingsSha256 SHA-256 of {@code settingsJson}'s UTF-8 bytes, lower-case hex
 * @param programVersion trapmap's version
 */
public record RunInfo(Instant startedAt, String rulesFile, String rulesSha256, String settingsJson,
                      String settingsSha256, String programVersion) {
    public RunInfo {
        Objects.requireNonNull(startedAt, "startedAt");
        rulesFile = Objects.requireNonNullElse(rulesFile, "");
        rulesSha256 = Objects.requireNonNullElse(rulesSha256, "");
        settingsJson = Objects.requireNonNullElse(settingsJson, "{}");
        settingsSha256 = Objects.requireNonNullElse(settingsSha256, "");
        programVersion = Objects.requireNonNullElse(programVersion, "");
    }

    /**
     * The run of a batch with {@code source} (program version, rules file and its SHA-256) judging with
     * {@code physics}, started {@code now}: the settings as compact JSON, hashed as the run record hashes them.
     */
    public static RunInfo of(RunManifest.Source source, PhysicsSettings physics, Instant now) {
        String json;
        try {
            json = new ObjectMapper().writeValueAsString(PhysicsSettingsFile.toJson(physics));
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("the physics settings could not be written as JSON", e);
        }
        return new RunInfo(now, source.rulesFile(), source.rulesSha256(), json, WaferRecord.sha256(json),
                source.version());
    }
}
