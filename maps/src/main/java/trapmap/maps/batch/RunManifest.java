package trapmap.maps.batch;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.type.TypeReference;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import trapmap.maps.io.AtomicFiles;
import trapmap.maps.io.PhysicsSettingsFile;
import trapmap.physics.conversion.PhysicsSettings;

/**
 * The record of one batch run in its output folder, {@value #FILE_NAME}: what the results were made with (program
 * version, SHA-256 of the rules file's content, the physics settings and their SHA-256, the number of input files and
 * the SHA-256 of their list, whether thumbnails were written), when the run started, and its state. The batch writes
 * it (atomically) before anything else with state {@link State#RUNNING}, sets {@link State#FINISHING} once
 * {@code results.csv}, {@code regions.csv}, {@code footprints.csv}, the recurrence files and {@code results.json} are
 * complete, and {@link State#COMPLETE} last, after the summary. A folder whose record is not complete holds an
 * interrupted run, which {@code --resume} finishes.
 *
 * @param version      program version that made the results
 * @param state        how far the run got
 * @param started      when the run was first started (kept by resumed runs)
 * @param resumed      when it was last resumed, or null
 * @param finished     when it was completed, or null
 * @param rulesFile    the rules file as given (information only)
 * @param rulesSha256  SHA-256 of the rules file's bytes ("" when the rules did not come from a file)
 * @param physics      the physics settings in effect, in their JSON form
 * @param physicsSha256 SHA-256 of {@code physics} written as compact JSON
 * @param inputs       number of input files
 * @param inputsSha256 SHA-256 of the input files' absolute paths, one per line, in input order
 * @param thumbnails   whether thumbnails were written
 * @param thumbnailCaptions whether the thumbnails carry a caption strip
 * @param summaryPdf   what became of the summary PDF once the run was complete ("written", or why it is missing:
 *                     switched off, or what the Java runtime lacked); null while running and when the program said
 *                     nothing; never compared by {@link #differences}, so a resumed run may make the PDF
 */
public record RunManifest(String version, State state, Instant started, Instant resumed, Instant finished,
                          String rulesFile, String rulesSha256, Map<String, Object> physics, String physicsSha256,
                          int inputs, String inputsSha256, boolean thumbnails, boolean thumbnailCaptions,
                          String summaryPdf) {
    /** The file name in the output folder. */
    public static final String FILE_NAME = "run.json";
    static final String FORMAT = "trapmap-run/1";
    private static final ObjectMapper JSON = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);
    /** One line, for the physics settings' digest and comparison (a mapper is thread-safe once configured). */
    private static final ObjectMapper COMPACT = new ObjectMapper();

    /** How far a run got. */
    public enum State {
        /** Wafers are being inspected (or the run was interrupted then). */
        RUNNING,
        /** The results tables, recurrence files and results.json are complete; the summary is being written. */
        FINISHING,
        /** Everything was written. */
        COMPLETE;

        String key() {
            return name().toLowerCase(java.util.Locale.ROOT);
        }
    }

    /** Where the rules came from: the program version and the rules file with the SHA-256 of its content. */
    public record Source(String version, String rulesFile, String rulesSha256) {
        /** A batch started from code, without a rules file. */
        public static final Source UNKNOWN = new Source("", "", "");

        /**
         * The source of the rules read from {@code rulesFile} as {@code text} (its UTF-8 bytes, which are the
         * file's: {@link Rules#readText} accepts UTF-8 only), so the hash is of the very rules the batch judges by.
         */
        public static Source of(String version, Path rulesFile, String text) {
            return new Source(version, rulesFile.toString(), sha256(text.getBytes(StandardCharsets.UTF_8)));
        }
    }

    public RunManifest {
        Objects.requireNonNull(state, "state");
        physics = physics == null ? Map.of() : physics;
    }

    /** A new run's record, state {@link State#RUNNING}. */
    static RunManifest start(Source source, PhysicsSettings physics, List<Path> inputs, boolean thumbnails,
                             boolean thumbnailCaptions, Instant now) {
        Map<String, Object> p = PhysicsSettingsFile.toJson(physics);
        return new RunManifest(source.version(), State.RUNNING, now, null, null, source.rulesFile(),
                source.rulesSha256(), p, sha256(compact(p).getBytes(StandardCharsets.UTF_8)), inputs.size(),
                inputsSha256(inputs), thumbnails, thumbnails && thumbnailCaptions, null);
    }

    /**
     * The SHA-256 of the list of {@code inputs}: their absolute, normalised paths, one a line. Taken from the digest
     * made ahead ({@link #prepare}) when that was made of an equal list; else made here.
     */
    static String inputsSha256(List<Path> inputs) {
        InputsDigest a = ahead;
        if (a != null && a.inputs().equals(inputs)) {
            return a.sha256();
        }
        return InputsDigest.of(inputs).sha256();
    }

    /** The inputs' digest made ahead by {@link #prepare}; null before. */
    private static volatile InputsDigest ahead;

    /** A list of inputs and the SHA-256 of its text (see {@link #inputsSha256}). */
    record InputsDigest(List<Path> inputs, String sha256) {
        static InputsDigest of(List<Path> inputs) {
            StringBuilder list = new StringBuilder();
            for (Path f : inputs) {
                list.append(f.toAbsolutePath().normalize()).append('\n');
            }
            return new InputsDigest(List.copyOf(inputs),
                    RunManifest.sha256(list.toString().getBytes(StandardCharsets.UTF_8)));
        }
    }

    /**
     * A head start for a run over {@code inputs} (the files a command line most likely names; null: none), done on
     * a background thread while the command line is parsed: the digest of their list, which {@link #start} takes
     * when its inputs are an equal list (else it makes its own), and a record like the run's made and encoded once
     * (Jackson's serializers for it, the digest's provider), then dropped. Changes nothing a run writes; any failure
     * is ignored (the run reports its own).
     */
    public static void prepare(List<Path> inputs) {
        try {
            List<Path> files = inputs == null ? List.of() : inputs;
            if (!files.isEmpty()) {
                ahead = InputsDigest.of(files);
            }
            start(Source.UNKNOWN, PhysicsSettings.DEFAULTS, files, true, false, Instant.now()).json();
        } catch (RuntimeException | IOException e) {
            // only a head start
        }
    }

    /** This run resumed at {@code now}: the first start time of {@code earlier} is kept. */
    RunManifest resumedFrom(RunManifest earlier, Instant now) {
        return new RunManifest(version, State.RUNNING, earlier.started(), now, null, rulesFile, rulesSha256, physics,
                physicsSha256, inputs, inputsSha256, thumbnails, thumbnailCaptions, null);
    }

    RunManifest with(State s, Instant finishedAt) {
        return new RunManifest(version, s, started, resumed, finishedAt, rulesFile, rulesSha256, physics,
                physicsSha256, inputs, inputsSha256, thumbnails, thumbnailCaptions, summaryPdf);
    }

    /** This record with {@code summary_pdf} set to {@code text} (null: left out). */
    RunManifest withSummaryPdf(String text) {
        return new RunManifest(version, state, started, resumed, finished, rulesFile, rulesSha256, physics,
                physicsSha256, inputs, inputsSha256, thumbnails, thumbnailCaptions, text);
    }

    /**
     * What differs between the run recorded as {@code this} and {@code now}, one phrase each ("other rules (sha256
     * ab12… then, cd34… now)"); empty when {@code now} may resume this run.
     */
    public List<String> differences(RunManifest now) {
        return differences(now, true);
    }

    /** As {@link #differences(RunManifest)}, the input files compared only when {@code compareInputs} is true. */
    public List<String> differences(RunManifest now, boolean compareInputs) {
        List<String> d = new ArrayList<>();
        if (!version.equals(now.version)) {
            d.add("another program version (" + version + " then, " + now.version + " now)");
        }
        if (!rulesSha256.equals(now.rulesSha256)) {
            d.add("other rules (sha256 " + shortHash(rulesSha256) + " then, " + shortHash(now.rulesSha256) + " now)");
        }
        if (!physicsSha256.equals(now.physicsSha256)) {
            List<String> keys = new ArrayList<>();
            java.util.Set<String> all = new java.util.LinkedHashSet<>(physics.keySet());
            all.addAll(now.physics.keySet());
            for (String k : all) {
                if (!Objects.equals(String.valueOf(physics.get(k)), String.valueOf(now.physics.get(k)))) {
                    keys.add(k + " " + physics.get(k) + " then, " + now.physics.get(k) + " now");
                }
            }
            d.add("other physics settings (" + (keys.isEmpty() ? "sha256 " + shortHash(physicsSha256) + " then, "
                    + shortHash(now.physicsSha256) + " now" : String.join("; ", keys)) + ")");
        }
        if (compareInputs && !inputsSha256.equals(now.inputsSha256)) {
            d.add("other input files (" + inputs + " files, list sha256 " + shortHash(inputsSha256) + " then; "
                    + now.inputs + " files, " + shortHash(now.inputsSha256) + " now)");
        }
        if (thumbnails != now.thumbnails) {
            d.add("thumbnails " + (thumbnails ? "on" : "off") + " then, " + (now.thumbnails ? "on" : "off") + " now");
        } else if (thumbnailCaptions != now.thumbnailCaptions) {
            d.add("thumbnail captions " + (thumbnailCaptions ? "on" : "off") + " then, "
                    + (now.thumbnailCaptions ? "on" : "off") + " now");
        }
        return d;
    }

    /** Writes {@value #FILE_NAME} into {@code dir} atomically. */
    void write(Path dir) throws IOException {
        byte[] bytes = json();
        Path file = dir.resolve(FILE_NAME);
        OutputFolder.write(file, () -> AtomicFiles.write(file, bytes));
    }

    /** The content of {@value #FILE_NAME}. */
    private byte[] json() throws IOException {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("format", FORMAT);
        m.put("version", version);
        m.put("state", state.key());
        m.put("started", started.toString());
        m.put("resumed", resumed == null ? null : resumed.toString());
        m.put("finished", finished == null ? null : finished.toString());
        m.put("rules_file", rulesFile);
        m.put("rules_sha256", rulesSha256);
        m.put("physics", physics);
        m.put("physics_sha256", physicsSha256);
        m.put("inputs", inputs);
        m.put("inputs_sha256", inputsSha256);
        m.put("thumbnails", thumbnails);
        m.put("thumbnail_captions", thumbnailCaptions);
        if (summaryPdf != null) {
            m.put("summary_pdf", summaryPdf);
        }
        return JSON.writeValueAsBytes(m);
    }

    /** The record in {@code dir}, or null when there is none. */
    public static RunManifest read(Path dir) throws IOException {
        Path file = dir.resolve(FILE_NAME);
        if (!Files.isRegularFile(file)) {
            return null;
        }
        Map<String, Object> m;
        try {
            m = JSON.readValue(file.toFile(), new TypeReference<LinkedHashMap<String, Object>>() { });
        } catch (JsonProcessingException e) {
            throw new IOException(file + ": not a run record (" + e.getOriginalMessage() + ")", e);
        }
        if (!FORMAT.equals(m.get("format"))) {
            throw new IOException(file + ": not a run record (format is " + m.get("format") + ", expected "
                    + FORMAT + ")");
        }
        try {
            @SuppressWarnings("unchecked")
            Map<String, Object> physics = (Map<String, Object>) m.get("physics");
            return new RunManifest(text(m, "version"), State.valueOf(text(m, "state").toUpperCase(java.util.Locale.ROOT)),
                    Instant.parse(text(m, "started")), instant(m, "resumed"), instant(m, "finished"),
                    text(m, "rules_file"), text(m, "rules_sha256"), physics, text(m, "physics_sha256"),
                    ((Number) m.get("inputs")).intValue(), text(m, "inputs_sha256"),
                    Boolean.TRUE.equals(m.get("thumbnails")), Boolean.TRUE.equals(m.get("thumbnail_captions")),
                    m.get("summary_pdf") instanceof String t ? t : null);
        } catch (RuntimeException e) {
            throw new IOException(file + ": not a run record (" + e.getMessage() + ")", e);
        }
    }

    /**
     * The record of {@code dir} when its results may be read: the tables, recurrence files and {@code results.json}
     * are complete (state finishing or complete) and were made with {@code physics} (null: not checked).
     *
     * @throws IOException naming the folder and what is wrong: no record, an interrupted run, other physics settings
     */
    public static RunManifest requireResults(Path dir, PhysicsSettings physics) throws IOException {
        RunManifest m = read(dir);
        if (m == null) {
            throw new IOException(dir + " has no " + FILE_NAME + ": not the output folder of a trapmap inspect run"
                    + " (or one made before runs were recorded); run inspect again");
        }
        if (m.state() == State.RUNNING) {
            throw new IOException(dir + " holds an unfinished run (" + FILE_NAME + " says running, started "
                    + m.started() + "): its results are incomplete; finish it with inspect --resume");
        }
        if (physics != null) {
            Map<String, Object> p = PhysicsSettingsFile.toJson(physics);
            if (!compact(p).equals(compact(m.physics()))) {
                throw new IOException(dir + " was run with other physics settings (" + compact(m.physics())
                        + ") than these (" + compact(p) + ")");
            }
        }
        return m;
    }

    private static String text(Map<String, Object> m, String key) {
        Object v = m.get(key);
        if (v == null) {
            throw new IllegalArgumentException("\"" + key + "\" is missing");
        }
        return v.toString();
    }

    private static Instant instant(Map<String, Object> m, String key) {
        Object v = m.get(key);
        return v == null ? null : Instant.parse(v.toString());
    }

    static String compact(Map<String, Object> json) {
        try {
            return COMPACT.writeValueAsString(json);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private static String shortHash(String hex) {
        return hex.isEmpty() ? "none" : hex.substring(0, Math.min(12, hex.length())) + "…";
    }

    /** SHA-256 of {@code bytes} in lower-case hex. */
    public static String sha256(byte[] bytes) {
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(bytes));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("SHA-256 is part of every Java platform", e);
        }
    }
}
