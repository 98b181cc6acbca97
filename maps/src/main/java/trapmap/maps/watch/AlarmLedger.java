package trapmap.maps.watch;

import java.io.IOException;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.Collection;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import org.apache.commons.csv.CSVRecord;
import trapmap.maps.io.AtomicFiles;

/**
 * What the watch's alarms of one kind have dealt with, kept in the output folder and rewritten atomically, so that
 * an alarm is raised at least once whatever moment the watch is killed at (SIGKILL, a power cut), and at worst twice.
 * Two ledgers: {@value #SIGNALS} for the control-chart signal alarm (the maps whose signals were looked at) and
 * {@value #FAILURES} for the alarm of failed wafers (the maps whose fail or error alarm was taken up).
 *
 * <p>A map is recorded in the same atomic write as the alarms it brings, which are recorded as pending; an alarm
 * leaves the pending list only once it has been raised ({@link #raised}: the alarm file line appended and the program
 * run to its end). A watch started again raises the pending alarms of the killed one first ({@link #pendingAlarms}),
 * then looks at the maps not recorded. So a kill before the record leaves the map to be looked at again, a kill
 * after it leaves its alarms pending, and only a kill between the alarm and the end of its record repeats it.
 *
 * <p>The file: the recorded maps one a line (as the results table writes them, line breaks as spaces); when alarms
 * are pending, an empty line and then the pending alarms as CSV records ({@code TIME,WAFER_ID,LAST,ARG...}). A folder
 * without the file is taken as dealt with whole when the ledger is opened (a folder watched before the ledger
 * existed does not raise its whole history at once).
 */
public final class AlarmLedger {
    /** The signal alarm's ledger in the output folder (hidden, as the watch's lock). */
    public static final String SIGNALS = ".watch-signals";
    /** The failed wafers' alarm ledger in the output folder. */
    public static final String FAILURES = ".watch-alarms";

    private final Path file;
    private final Set<String> looked;
    private final List<Alarm.Raising> pending;

    private AlarmLedger(Path file, Set<String> looked, List<Alarm.Raising> pending) {
        this.file = file;
        this.looked = looked;
        this.pending = pending;
    }

    /**
     * Opens the ledger {@code name} ({@link #SIGNALS} or {@link #FAILURES}) of output folder {@code out}; when it has
     * none, makes it with {@code listed} (the maps the folder's results table lists now) as dealt with.
     *
     * @throws IOException when the file cannot be read or is not a ledger (the message names it)
     */
    public static AlarmLedger open(Path out, String name, Collection<String> listed) throws IOException {
        Path f = out.resolve(name);
        if (Files.exists(f)) {
            String text = Files.readString(f, StandardCharsets.UTF_8);
            Set<String> looked = new LinkedHashSet<>();
            int at = 0;
            while (at < text.length()) {
                int end = text.indexOf('\n', at);
                if (end < 0) {
                    end = text.length();
                }
                String line = text.substring(at, end);
                at = end + 1;
                if (line.isEmpty()) {
                    break; // the pending alarms follow
                }
                looked.add(line);
            }
            List<Alarm.Raising> pending = new ArrayList<>();
            if (at < text.length()) {
                try {
                    for (CSVRecord r : CSVFormat.DEFAULT.parse(new StringReader(text.substring(at)))) {
                        if (r.size() < 4) {
                            throw new IOException(f + ": a pending alarm needs TIME,WAFER_ID,LAST,ARG (record "
                                    + r.getRecordNumber() + " has " + r.size() + " fields)");
                        }
                        List<String> v = r.toList();
                        pending.add(new Alarm.Raising(Instant.parse(v.get(0)), v.get(1), v.subList(3, v.size()),
                                v.get(2)));
                    }
                } catch (DateTimeParseException e) {
                    throw new IOException(f + ": a pending alarm's TIME is not an ISO-8601 UTC time: "
                            + e.getParsedString());
                } catch (UncheckedIOException e) {
                    throw new IOException(f + ": the pending alarms cannot be read: " + e.getMessage());
                }
            }
            return new AlarmLedger(f, looked, pending);
        }
        AlarmLedger l = new AlarmLedger(f, new LinkedHashSet<>(listed), new ArrayList<>());
        l.save();
        return l;
    }

    /** The maps of {@code listed} not yet recorded, in their order. */
    public synchronized List<String> pending(Collection<String> listed) {
        return listed.stream().filter(f -> !looked.contains(f)).toList();
    }

    /** The alarms recorded but not yet {@linkplain #raised raised} (a killed watch's), in their order. */
    public synchronized List<Alarm.Raising> pendingAlarms() {
        return List.copyOf(pending);
    }

    /** Records {@code files} as dealt with, bringing no alarm. */
    public void add(Collection<String> files) throws IOException {
        add(files, List.of());
    }

    /**
     * Records {@code files} as dealt with and {@code alarms} (those they bring) as pending, in one atomic write,
     * before the alarms are raised.
     */
    public synchronized void add(Collection<String> files, List<Alarm.Raising> alarms) throws IOException {
        boolean changed = looked.addAll(files);
        if (changed || !alarms.isEmpty()) {
            pending.addAll(alarms);
            save();
        }
    }

    /** Takes {@code alarm} off the pending list: it has been raised. */
    public synchronized void raised(Alarm.Raising alarm) throws IOException {
        if (pending.remove(alarm)) {
            save();
        }
    }

    private void save() throws IOException {
        StringBuilder b = new StringBuilder();
        for (String f : looked) {
            b.append(f.replaceAll("[\\r\\n]", " ")).append('\n');
        }
        if (!pending.isEmpty()) {
            b.append('\n');
            try (CSVPrinter p = new CSVPrinter(b, CSVFormat.DEFAULT.builder().setRecordSeparator('\n').build())) {
                for (Alarm.Raising a : pending) {
                    List<String> v = new ArrayList<>(List.of(a.time().toString(), a.waferId(), a.last()));
                    v.addAll(a.args());
                    p.printRecord(v);
                }
            }
        }
        AtomicFiles.write(file, b.toString().getBytes(StandardCharsets.UTF_8));
    }
}
