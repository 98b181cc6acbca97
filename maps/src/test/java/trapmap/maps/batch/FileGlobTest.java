package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;

import java.nio.file.FileSystems;
import java.nio.file.Path;
import java.nio.file.PathMatcher;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import trapmap.shared.text.TextLimits;

/** File-name globs: the same answers as java.nio's glob matcher, in time linear in the name for a given glob. */
class FileGlobTest {
    /** A hang guard only: the checks are on the result. */
    private static final Duration HANG_GUARD = Duration.ofSeconds(10);

    private static final String[] TOKENS = {"a", "b", ".", "-", "*", "**", "?", "[ab]", "[!a]", "[a-c]", "[-.]",
        "{a,b*}", "{,.}", "\\*", "\\{", "}", ","};
    private static final String NAME_CHARS = "ab.-c*{},";

    private static boolean reference(String glob, String name) {
        PathMatcher m = FileSystems.getDefault().getPathMatcher("glob:" + glob);
        return m.matches(Path.of(name));
    }

    @Test
    void agreesWithTheJavaNioGlobMatcherOnRandomSmallCases() {
        Random r = new Random(20261204);
        int matched = 0;
        for (int t = 0; t < 20_000; t++) {
            StringBuilder g = new StringBuilder();
            int tokens = 1 + r.nextInt(6);
            for (int i = 0; i < tokens; i++) {
                g.append(TOKENS[r.nextInt(TOKENS.length)]);
            }
            String glob = g.toString();
            boolean valid;
            try {
                FileSystems.getDefault().getPathMatcher("glob:" + glob);
                valid = true;
            } catch (RuntimeException e) {
                valid = false;
            }
            if (!valid) {
                assertThatThrownBy(() -> FileGlob.compile(glob)).as(glob).isInstanceOf(IllegalArgumentException.class);
                continue;
            }
            FileGlob compiled = FileGlob.compile(glob);
            StringBuilder n = new StringBuilder();
            int length = 1 + r.nextInt(8);
            for (int i = 0; i < length; i++) {
                n.append(NAME_CHARS.charAt(r.nextInt(NAME_CHARS.length())));
            }
            String name = n.toString();
            boolean expected = reference(glob, name);
            assertThat(compiled.matches(name)).as("'%s' on '%s'", glob, name).isEqualTo(expected);
            matched += expected ? 1 : 0;
        }
        assertThat(matched).as("cases that match").isGreaterThan(500);
    }

    @Test
    void pathsKeepTheSeparatorRulesOfStarAndDoubleStar() {
        assertThat(FileGlob.compile("*.tif").matches("lot/w1.tif")).isFalse();
        assertThat(FileGlob.compile("**.tif").matches("lot/w1.tif")).isTrue();
        assertThat(FileGlob.compile("lot?w1.tif").matches("lot/w1.tif")).isFalse();
        assertThat(FileGlob.compile("lot/w[0-9].tif").matches("lot/w1.tif")).isTrue();
        assertThat(reference("**.tif", "lot/w1.tif")).isTrue();
    }

    @Test
    void twentyTwoStarsAgainstATenThousandCharacterNameAnswerAtOnce() {
        String glob = "*a".repeat(21) + "*b";
        String noMatch = "a".repeat(10_000);
        String match = "a".repeat(9_999) + "b";
        FileGlob g = FileGlob.compile(glob);
        assertThat(glob.chars().filter(c -> c == '*').count()).isEqualTo(22);
        assertThat(assertTimeoutPreemptively(HANG_GUARD, () -> g.matches(noMatch))).isFalse();
        assertThat(assertTimeoutPreemptively(HANG_GUARD, () -> g.matches(match))).isTrue();
        assertThat(assertTimeoutPreemptively(HANG_GUARD, () -> g.matches("a".repeat(20) + "b"))).isFalse();
        assertThat(reference(glob, "a".repeat(21) + "b")).isTrue();
        assertThat(g.matches("a".repeat(21) + "b")).isTrue();
    }

    @Test
    void aGlobLongerThanTheLimitIsRefused() {
        String ok = "*".repeat(TextLimits.MAX_GLOB_CHARS);
        assertThat(FileGlob.compile(ok).matches("x")).isTrue();
        assertThatThrownBy(() -> FileGlob.compile(ok + "x"))
                .hasMessage("the glob is 1025 characters long; at most 1024 are allowed");
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
            "*.{tif|missing '}' at index 5",
            "{a,{b}}|groups cannot nest at index 3",
            "[ab|missing ']' at index 2",
            "[a/]|a class cannot hold the name separator '/' at index 2",
            "[c-a]|invalid range at index 1",
            "a\\|no character to escape at index 1"})
    void invalidGlobsSayWhatAndWhere(String glob, String message) {
        assertThatThrownBy(() -> FileGlob.compile(glob)).isInstanceOf(IllegalArgumentException.class)
                .hasMessage(message);
    }

    /** The parts a regular expression with one reluctant group per wildcard gives, or null (small cases only). */
    private static List<String> referenceParts(String glob, String name) {
        StringBuilder r = new StringBuilder();
        for (char c : glob.toCharArray()) {
            r.append(c == '*' ? "(.*?)" : c == '?' ? "(.)" : Pattern.quote(String.valueOf(c)));
        }
        Matcher m = Pattern.compile(r.toString()).matcher(name);
        if (!m.matches()) {
            return null;
        }
        List<String> parts = new ArrayList<>();
        for (int i = 1; i <= m.groupCount(); i++) {
            parts.add(m.group(i));
        }
        return parts;
    }

    @Test
    void wildcardPartsAreThoseOfReluctantGroups() {
        Random r = new Random(7);
        for (int t = 0; t < 5_000; t++) {
            StringBuilder g = new StringBuilder();
            for (int i = 0, n = 1 + r.nextInt(7); i < n; i++) {
                g.append("ab*?-".charAt(r.nextInt(5)));
            }
            StringBuilder s = new StringBuilder();
            for (int i = 0, n = r.nextInt(9); i < n; i++) {
                s.append("ab-".charAt(r.nextInt(3)));
            }
            assertThat(FileGlob.wildcardParts(g.toString(), s.toString())).as("'%s' on '%s'", g, s)
                    .isEqualTo(referenceParts(g.toString(), s.toString()));
        }
    }

    @Test
    void wildcardPartsOfManyStarsOnALongNameAnswerAtOnce() {
        String glob = "*a".repeat(21) + "*b";
        List<String> parts = assertTimeoutPreemptively(HANG_GUARD, () -> FileGlob.wildcardParts(glob,
                "a".repeat(5_000)));
        assertThat(parts).isNull();
        List<String> found = FileGlob.wildcardParts(glob, "a".repeat(4_999) + "b");
        assertThat(found).hasSize(22);
        assertThat(found.subList(0, 21)).containsOnly("");
        assertThat(found.get(21)).hasSize(4_999 - 21);
    }
}
