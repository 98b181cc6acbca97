package trapmap.maps.watch;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Collection;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import trapmap.maps.io.AtomicFiles;

/**
 * Which wafers of a watch's output folder the signal alarm has looked at, kept in the folder
 * ({@value #FILE_NAME}, one map file a line as the results table writes it, rewritten atomically), so that a watch
 * killed between storing a round's wafers and looking at the signals they bring looks at them on its next start, and
 * never looks at a wafer twice. A folder without the file is taken as looked at whole when the ledger is opened (a
 * folder watched before the alarm existed does not raise its whole history at once).
 */
public final class SignalLedger {
    /** The ledger's file in the output folder (hidden, as the watch's lock). */
    public static final String FILE_NAME = ".watch-signals";

    private final Path file;
    private final Set<String> looked;

    private SignalLedger(Path file, Set<String> looked) {
        this.file = file;
        this.looked = looked;
    }

    /**
     * Opens the ledger of output folder {@code out}; when it has none, makes it with {@code listed} (the maps the
     * folder's results table lists now) as looked at.
     */
    public static SignalLedger open(Path out, List<String> listed) throws IOException {
        Path f = out.resolve(FILE_NAME);
        if (Files.exists(f)) {
            Set<String> looked = new LinkedHashSet<>();
            for (String line : Files.readAllLines(f, StandardCharsets.UTF_8)) {
                if (!line.isEmpty()) {
                    looked.add(line);
                }
            }
            return new SignalLedger(f, looked);
        }
        SignalLedger l = new SignalLedger(f, new LinkedHashSet<>(listed));
        l.save();
        return l;
    }

    /** The maps of {@code listed} not yet looked at, in their order. */
    public synchronized List<String> pending(List<String> listed) {
        return listed.stream().filter(f -> !looked.contains(f)).toList();
    }

    /** Records {@code files} as looked at (before their signals are raised: a signal is never raised twice). */
    public synchronized void add(Collection<String> files) throws IOException {
        if (looked.addAll(files)) {
            save();
        }
    }

    private void save() throws IOException {
        StringBuilder b = new StringBuilder();
        for (String f : looked) {
            b.append(f.replaceAll("[\\r\\n]", " ")).append('\n');
        }
        AtomicFiles.write(file, b.toString().getBytes(StandardCharsets.UTF_8));
    }
}
