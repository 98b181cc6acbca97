package trapmap.launcher;

import static org.assertj.core.api.Assertions.assertThat;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.attribute.FileTime;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.jar.Attributes;
import java.util.jar.JarEntry;
import java.util.jar.JarOutputStream;
import java.util.jar.Manifest;
import java.util.stream.Stream;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The {@code trapmap} launcher script and its class-data archive, on a copy of the script in a temporary folder
 * laid out like the repository, with a small jar ({@link LauncherProbe}) in place of the application jar (no build
 * runs: the folder holds no sources). Every run must work whether the archive is missing, older than the jar or
 * damaged; a usable archive must actually serve the classes.
 */
class LauncherArchiveTest {
    private static final Path LAUNCHER = Path.of("..", "trapmap").toAbsolutePath().normalize();
    private static final String PROBE = LauncherProbe.class.getName();

    @TempDir
    Path root;
    private Path jar;
    private Path archive;

    /** Exit code and output (standard output and error together) of one launcher run. */
    private record Run(int code, String output) {
        boolean probeFromArchive() {
            return output.lines().anyMatch(l -> l.contains(" " + PROBE + " source: shared objects file"));
        }
    }

    @BeforeEach
    void layOut() throws IOException {
        assumeTrue(Files.isExecutable(Path.of("/bin/bash")), "the launcher is a bash script");
        Files.copy(LAUNCHER, root.resolve("trapmap"));
        Files.createDirectories(root.resolve("viewer/target"));
        jar = root.resolve("viewer/target/trapmap.jar");
        archive = root.resolve("viewer/target/trapmap.jsa");
        writeJar("1");
    }

    /** The probe jar; {@code version} goes into a resource, so that two versions differ in content and size. */
    private void writeJar(String version) throws IOException {
        Manifest m = new Manifest();
        m.getMainAttributes().put(Attributes.Name.MANIFEST_VERSION, "1.0");
        m.getMainAttributes().put(Attributes.Name.MAIN_CLASS, PROBE);
        Path tmp = root.resolve("viewer/target/probe.tmp");
        try (OutputStream out = Files.newOutputStream(tmp); JarOutputStream jarOut = new JarOutputStream(out, m)) {
            String entry = PROBE.replace('.', '/') + ".class";
            jarOut.putNextEntry(new JarEntry(entry));
            try (InputStream in = LauncherProbe.class.getClassLoader().getResourceAsStream(entry)) {
                in.transferTo(jarOut);
            }
            jarOut.putNextEntry(new JarEntry("version.txt"));
            jarOut.write(("probe version " + version + "\n").repeat(Integer.parseInt(version))
                    .getBytes(StandardCharsets.UTF_8));
        }
        Files.move(tmp, jar, StandardCopyOption.REPLACE_EXISTING);
    }

    private Run launch(Map<String, String> env, String... args) throws IOException, InterruptedException {
        List<String> cmd = new ArrayList<>(List.of("/bin/bash", root.resolve("trapmap").toString()));
        cmd.addAll(List.of(args));
        ProcessBuilder pb = new ProcessBuilder(cmd).directory(root.toFile()).redirectErrorStream(true);
        Path javaBin = Path.of(System.getProperty("java.home"), "bin");
        pb.environment().put("PATH", javaBin + ":" + System.getenv().getOrDefault("PATH", "/usr/bin:/bin"));
        pb.environment().remove("JAVA_OPTS");
        pb.environment().remove("TRAPMAP_CDS");
        pb.environment().putAll(env);
        Process p = pb.start();
        String output = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        assertThat(p.waitFor(120, TimeUnit.SECONDS)).as("launcher finished").isTrue();
        return new Run(p.exitValue(), output);
    }

    /** A launcher run that logs where each class came from. */
    private Run launchLogged(String... args) throws IOException, InterruptedException {
        return launch(Map.of("JAVA_OPTS", "-Xlog:class+load=info"), args);
    }

    private void assertRanProbe(Run r, String args) {
        assertThat(r.code()).as(r.output()).isZero();
        assertThat(r.output()).contains("probe ran with [" + args + "]");
        try (Stream<Path> files = Files.list(root)) {
            assertThat(files.map(f -> f.getFileName().toString())).as("no JVM crash log")
                    .noneMatch(n -> n.startsWith("hs_err"));
        } catch (IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }

    @Test
    void aMissingArchiveIsMadeAndThenServesTheClasses() throws Exception {
        assertThat(archive).doesNotExist();
        assertRanProbe(launch(Map.of(), "convert", "a b"), "convert a b");
        assertThat(archive).isRegularFile();
        assertThat(Files.getLastModifiedTime(archive).compareTo(Files.getLastModifiedTime(jar))).isPositive();
        assertThat(root.resolve("viewer/target/trapmap.jsa.key")).content().contains(jar.toRealPath().toString());
        try (Stream<Path> files = Files.list(root.resolve("viewer/target"))) {
            assertThat(files.map(f -> f.getFileName().toString())).as("no training folder left")
                    .noneMatch(n -> n.startsWith(".trapmap-cds"));
        }

        Run second = launchLogged("--help");
        assertRanProbe(second, "--help");
        assertThat(second.probeFromArchive()).as(second.output()).isTrue();
    }

    @Test
    void anArchiveOlderThanTheJarIsMadeAgain() throws Exception {
        assertRanProbe(launch(Map.of(), "--help"), "--help");
        FileTime before = Files.getLastModifiedTime(archive);
        writeJar("2"); // another jar: the old archive's classes no longer match it
        Files.setLastModifiedTime(jar, FileTime.fromMillis(before.toMillis() + 30_000));

        Run r = launchLogged("stats");
        assertRanProbe(r, "stats");
        FileTime remade = Files.getLastModifiedTime(archive);
        assertThat(remade.compareTo(Files.getLastModifiedTime(jar))).isPositive();
        assertThat(r.probeFromArchive()).as(r.output()).isTrue();

        // the jar is dated in the future, yet the next run keeps the archive
        Run again = launchLogged("stats");
        assertRanProbe(again, "stats");
        assertThat(Files.getLastModifiedTime(archive)).isEqualTo(remade);
        assertThat(again.probeFromArchive()).as(again.output()).isTrue();
    }

    @Test
    void aDamagedArchiveIsIgnored() throws Exception {
        assertRanProbe(launch(Map.of(), "--help"), "--help");
        FileTime made = Files.getLastModifiedTime(archive);
        byte[] bytes = Files.readAllBytes(archive);
        for (int i = 4096; i < bytes.length; i += 509) {
            bytes[i] ^= (byte) 0x5a;
        }
        archive.toFile().setWritable(true);
        Files.write(archive, bytes);
        Files.setLastModifiedTime(archive, made); // still newer than the jar: the launcher keeps it

        Run r = launchLogged("convert");
        assertRanProbe(r, "convert");
        assertThat(r.probeFromArchive()).as(r.output()).isFalse();

        Files.writeString(archive, "not an archive\n");
        Files.setLastModifiedTime(archive, made);
        assertRanProbe(launch(Map.of(), "view"), "view");
    }

    @Test
    void withTrapmapCdsZeroNoArchiveIsMadeOrUsed() throws Exception {
        Run r = launchLogged("--help");
        assertThat(r.probeFromArchive()).as(r.output()).isTrue();
        Files.delete(archive);
        Run off = launch(Map.of("TRAPMAP_CDS", "0", "JAVA_OPTS", "-Xlog:class+load=info"), "--help");
        assertRanProbe(off, "--help");
        assertThat(off.probeFromArchive()).isFalse();
        assertThat(archive).doesNotExist();
    }

    /** The number of processors this machine gives a process, as the launcher reads it ({@code nproc}). */
    private static int processors() throws IOException, InterruptedException {
        Process p = new ProcessBuilder("nproc").redirectErrorStream(true).start();
        String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8).strip();
        assertThat(p.waitFor(10, TimeUnit.SECONDS)).isTrue();
        return Integer.parseInt(out);
    }

    @Test
    void anInspectRunCollectsSeriallyOnTwoProcessorsUnlessJavaOptsNamesACollector() throws Exception {
        assumeTrue(Files.isExecutable(Path.of("/usr/bin/nproc")) || Files.isExecutable(Path.of("/bin/nproc")),
                "nproc");
        boolean fewCores = processors() <= 2;
        Map<String, String> flags = Map.of("TRAPMAP_CDS", "0", "JAVA_OPTS", "-XX:+PrintCommandLineFlags");
        Run inspect = launch(flags, "inspect", "in");
        assertRanProbe(inspect, "inspect in");
        assertThat(inspect.output().contains("-XX:+UseSerialGC")).as(inspect.output()).isEqualTo(fewCores);
        assertThat(inspect.output()).contains("-XX:Tier4InvocationThreshold=20000");

        Run convert = launch(flags, "convert", "in");
        assertRanProbe(convert, "convert in");
        assertThat(convert.output()).doesNotContain("-XX:+UseSerialGC").doesNotContain("Tier4InvocationThreshold");

        // a collector of the caller's own: the launcher adds none (two would stop Java at start)
        Run parallel = launch(Map.of("TRAPMAP_CDS", "0", "JAVA_OPTS", "-XX:+UseParallelGC -XX:+PrintCommandLineFlags"),
                "inspect", "in");
        assertRanProbe(parallel, "inspect in");
        assertThat(parallel.output()).contains("-XX:+UseParallelGC").doesNotContain("-XX:+UseSerialGC");
    }
}
