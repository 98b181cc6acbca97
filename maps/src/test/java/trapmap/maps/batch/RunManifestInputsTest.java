package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The run record's digest of the input list is the SHA-256 of the absolute, normalised paths one a line, whether made
 * when the run starts or ahead ({@link RunManifest#prepare}, on another thread while the command line is parsed): the
 * digest made ahead is taken only for an equal list.
 */
class RunManifestInputsTest {
    /** The digest written out: the list's text hashed with the platform's SHA-256 directly. */
    private static String reference(List<Path> inputs) throws Exception {
        StringBuilder text = new StringBuilder();
        for (Path p : inputs) {
            text.append(p.toAbsolutePath().normalize()).append('\n');
        }
        return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256")
                .digest(text.toString().getBytes(StandardCharsets.UTF_8)));
    }

    private static List<Path> maps(String prefix, int n) {
        List<Path> l = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            l.add(Path.of("bench", "..", "maps", prefix + i + ".tif"));
        }
        return l;
    }

    @Test
    void theDigestMadeAheadIsTakenOnlyForTheSameList() throws Exception {
        List<Path> a = maps("A-", 600);
        List<Path> b = new ArrayList<>(a);
        b.set(599, Path.of("maps", "other.tif"));
        List<Path> shorter = a.subList(0, 599);
        assertThat(RunManifest.inputsSha256(a)).isEqualTo(reference(a)); // nothing made ahead yet, or another list
        RunManifest.prepare(a);
        assertThat(RunManifest.inputsSha256(new ArrayList<>(a))).isEqualTo(reference(a));
        assertThat(RunManifest.inputsSha256(b)).isEqualTo(reference(b)).isNotEqualTo(reference(a));
        assertThat(RunManifest.inputsSha256(shorter)).isEqualTo(reference(shorter));
        assertThat(RunManifest.inputsSha256(List.of())).isEqualTo(reference(List.of()));
        RunManifest.prepare(null); // no guess: nothing changes, nothing fails
        RunManifest.prepare(List.of());
        assertThat(RunManifest.inputsSha256(a)).isEqualTo(reference(a));
    }

    @Test
    void aRunRecordsTheDigestOfItsInputs() throws Exception {
        List<Path> a = maps("R-", 5);
        RunManifest.prepare(maps("other-", 5));
        RunManifest m = RunManifest.start(RunManifest.Source.UNKNOWN, trapmap.physics.conversion.PhysicsSettings.DEFAULTS,
                a, true, false, java.time.Instant.EPOCH);
        assertThat(m.inputsSha256()).isEqualTo(reference(a));
        assertThat(m.inputs()).isEqualTo(5);
    }
}
