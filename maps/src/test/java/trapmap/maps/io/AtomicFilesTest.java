package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.HashSet;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The temporary files of {@link AtomicFiles}: new, private, named {@code .NAME.<number>.tmp}, never reused. */
class AtomicFilesTest {
    @TempDir
    Path dir;

    @Test
    void temporariesAreNewPrivateFilesWithDistinctNames() throws IOException {
        Set<Path> made = new HashSet<>();
        for (int i = 0; i < 300; i++) {
            Path t = AtomicFiles.createTemporary(dir, ".map.tif.", ".tmp");
            assertThat(t.getParent()).isEqualTo(dir);
            assertThat(t.getFileName().toString()).matches("\\.map\\.tif\\.[0-9]+\\.tmp");
            assertThat(Files.size(t)).isZero();
            assertThat(made.add(t)).as("a new name").isTrue();
        }
        assertThat(Files.list(dir).count()).isEqualTo(300);
        assumeTrue(dir.getFileSystem().supportedFileAttributeViews().contains("posix"));
        for (Path t : made) {
            assertThat(PosixFilePermissions.toString(Files.getPosixFilePermissions(t))).isEqualTo("rw-------");
        }
    }

    @Test
    void writtenFileHasTheUsualPermissionsAndNoTemporaryIsLeft() throws IOException {
        Path target = dir.resolve("out.csv");
        AtomicFiles.write(target, "a,b\n".getBytes(java.nio.charset.StandardCharsets.US_ASCII));
        assertThat(Files.readString(target)).isEqualTo("a,b\n");
        try (var names = Files.list(dir)) {
            assertThat(names.map(p -> p.getFileName().toString())).containsExactly("out.csv");
        }
        assumeTrue(dir.getFileSystem().supportedFileAttributeViews().contains("posix"));
        assertThat(PosixFilePermissions.toString(Files.getPosixFilePermissions(target))).isEqualTo("rw-r--r--");
    }
}
