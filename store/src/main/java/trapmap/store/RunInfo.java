package trapmap.store;

import java.time.Instant;
import java.util.Objects;

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
}
