package trapmap.store;

import java.io.IOException;
import java.net.ServerSocket;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.nio.file.attribute.UserPrincipal;
import java.time.Clock;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.stream.Stream;

/**
 * A real PostgreSQL server for tests, started from {@code initdb} and {@code pg_ctl} on a temporary data directory,
 * on a free localhost port, with password authentication (scram-sha-256) for the user {@value #USER}. As root
 * (PostgreSQL refuses to run as root) the server runs as the user {@code postgres} or {@code nobody} through
 * {@code runuser}. When no server can be started here ({@code initdb}/{@code pg_ctl} missing, or root without such a
 * user, or the start fails) {@link #skipped()} gives the reason, for {@code assumeTrue}. Shared with other modules'
 * tests through this module's test jar.
 * <p>
 * When the environment names a running server in {@value #ENV} ({@code postgresql://localhost:PORT/postgres}, with this
 * class's user and password; {@code scripts/pg-test-server start} makes one, and {@code .ci/run} does so before the
 * tests), that server is used instead and left running, each test in databases of its own, and a server that cannot be
 * reached is a failure, never a skip.
 */
public final class PostgresServer implements AutoCloseable {
    /** The user the server knows. */
    public static final String USER = "trapmap";
    /** Its password (a throw-away server's). */
    public static final String PASSWORD = "test-only-password";
    /** The environment variable naming a running server to use instead of starting one. */
    public static final String ENV = "TRAPMAP_TEST_PG";

    private Path base;
    private Path data;
    private List<String> asUser = new ArrayList<>();
    private Path pgCtl;
    private int port;
    private String skipped;
    /** Databases made by this test process, over every instance: several tests may share one external server. */
    private static final AtomicInteger DATABASES = new AtomicInteger();
    /** A server this class did not start (named by {@value #ENV}): used, never stopped. */
    private boolean external;

    private PostgresServer() {
    }

    /** Starts a server; never throws for a server that cannot run here ({@link #skipped()} says why). */
    public static PostgresServer start() throws IOException, InterruptedException {
        PostgresServer s = new PostgresServer();
        String given = System.getenv(ENV);
        if (given != null && !given.isBlank()) {
            s.useRunning(given.trim());
        } else {
            s.skipped = s.startServer();
        }
        return s;
    }

    /** Uses the running server at {@code url}; throws when it cannot be reached (a test must then fail). */
    private void useRunning(String url) throws IOException {
        java.util.regex.Matcher m = java.util.regex.Pattern.compile("postgresql://localhost:(\\d+)/postgres")
                .matcher(url);
        if (!m.matches()) {
            throw new IllegalStateException(ENV + " must be postgresql://localhost:PORT/postgres but was " + url);
        }
        external = true;
        port = Integer.parseInt(m.group(1));
        base = Files.createTempDirectory("trapmap-pg");
        Files.setPosixFilePermissions(base, PosixFilePermissions.fromString("rwxr-xr-x"));
        try (java.sql.Connection c = ResultsStore.postgres(url(), env()).getConnection()) {
            if (!c.isValid(10)) {
                throw new IllegalStateException(ENV + "=" + url + ": the server does not answer");
            }
        } catch (java.sql.SQLException e) {
            throw new IllegalStateException(ENV + "=" + url + ": the server cannot be reached: " + e.getMessage(), e);
        }
    }

    private String startServer() throws IOException, InterruptedException {
        Path initdb = tool("initdb");
        pgCtl = tool("pg_ctl");
        if (initdb == null || pgCtl == null) {
            return "initdb/pg_ctl not found on PATH, /usr/local/bin or /usr/lib/postgresql/*/bin";
        }
        base = Files.createTempDirectory("trapmap-pg");
        if ("root".equals(System.getProperty("user.name"))) {
            String runAs = null;
            for (String u : List.of("postgres", "nobody")) {
                if (run(List.of("id", "-u", u), 10) == 0) {
                    runAs = u;
                    break;
                }
            }
            Path runuser = Stream.of("/usr/sbin/runuser", "/sbin/runuser", "/usr/bin/runuser").map(Path::of)
                    .filter(Files::isExecutable).findFirst().orElse(null);
            if (runAs == null || runuser == null) {
                return "running as root without runuser and a user postgres or nobody to run the server as";
            }
            asUser = List.of(runuser.toString(), "-u", runAs, "--");
            UserPrincipal owner = base.getFileSystem().getUserPrincipalLookupService().lookupPrincipalByName(runAs);
            Files.setOwner(base, owner);
        }
        Files.setPosixFilePermissions(base, PosixFilePermissions.fromString("rwx--x--x"));
        data = base.resolve("data");
        Path pw = base.resolve("pw");
        Files.writeString(pw, PASSWORD + "\n");
        Files.setPosixFilePermissions(pw, PosixFilePermissions.fromString("rw-r--r--"));
        if (!asUser.isEmpty()) {
            Files.setOwner(pw, Files.getOwner(base));
        }
        int init = run(cmd(initdb.toString(), "-D", data.toString(), "-U", USER, "--pwfile=" + pw,
                "-A", "scram-sha-256", "-N", "-E", "UTF8", "--locale=C"), 120);
        if (init != 0) {
            return "initdb failed (exit " + init + ")";
        }
        try (ServerSocket s = new ServerSocket(0)) {
            port = s.getLocalPort();
        }
        int start = run(cmd(pgCtl.toString(), "-D", data.toString(), "-l", base.resolve("log").toString(), "-w",
                "-t", "60", "-o", "-p " + port + " -k " + base + " -c listen_addresses=localhost", "start"), 90);
        if (start != 0) {
            String log = Files.exists(base.resolve("log")) ? Files.readString(base.resolve("log")) : "";
            port = 0;
            return "the server did not start (exit " + start + "): " + log.lines().reduce((a, b) -> b).orElse("");
        }
        return null;
    }

    /** Why no server runs here, or null when it runs. */
    public String skipped() {
        return skipped;
    }

    /** The server's port. */
    public int port() {
        return port;
    }

    /** A folder the server's user may read, for the tests' files (removed with the server). */
    public Path base() {
        return base;
    }

    /** The store address of the server's database {@code postgres}. */
    public String url() {
        return url("postgres");
    }

    /** The store address of database {@code db} on this server. */
    public String url(String db) {
        return "postgresql://localhost:" + port + "/" + db;
    }

    /** The environment giving the store the server's user and password. */
    public Map<String, String> env() {
        return Map.of("PGUSER", USER, "PGPASSWORD", PASSWORD);
    }

    /**
     * Makes a new empty database on this server and returns its store address, so that tests sharing the server do
     * not see each other's rows.
     */
    public synchronized String newDatabase() throws java.sql.SQLException {
        // unique across the test processes that may share one server
        String db = "trapmap_test_" + ProcessHandle.current().pid() + "_" + DATABASES.incrementAndGet();
        try (java.sql.Connection c = ResultsStore.postgres(url(), env()).getConnection();
             java.sql.Statement st = c.createStatement()) {
            st.execute("CREATE DATABASE " + db);
        }
        return url(db);
    }

    /** Opens the store at {@code url} on this server with its credentials. */
    public ResultsStore open(String url, Clock clock) {
        return ResultsStore.open(url, env(), clock);
    }

    @Override
    public void close() throws IOException, InterruptedException {
        if (port != 0 && !external) {
            run(cmd(pgCtl.toString(), "-D", data.toString(), "-m", "immediate", "-w", "stop"), 60);
            port = 0;
        }
        if (base != null) {
            try (Stream<Path> all = Files.walk(base)) {
                all.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
            base = null;
        }
    }

    private List<String> cmd(String... args) {
        List<String> c = new ArrayList<>(asUser);
        c.addAll(List.of(args));
        return c;
    }

    private static int run(List<String> command, int timeoutS) throws IOException, InterruptedException {
        Process p = new ProcessBuilder(command).redirectErrorStream(true)
                .redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
        if (!p.waitFor(timeoutS, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            return -1;
        }
        return p.exitValue();
    }

    private static Path tool(String name) throws IOException {
        List<Path> places = new ArrayList<>();
        for (String d : System.getenv().getOrDefault("PATH", "").split(":")) {
            places.add(Path.of(d, name));
        }
        places.add(Path.of("/usr/local/bin", name));
        Path lib = Path.of("/usr/lib/postgresql");
        if (Files.isDirectory(lib)) {
            try (Stream<Path> versions = Files.list(lib)) {
                versions.sorted(Comparator.reverseOrder()).forEach(v -> places.add(v.resolve("bin").resolve(name)));
            }
        }
        return places.stream().filter(Files::isExecutable).findFirst().orElse(null);
    }
}
