package trapmap.maps.watch;

import java.io.IOException;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.io.MapFiles;

/**
 * Decides when a map arriving in a watched folder is complete, so that a partial file is never read. A map
 * ({@code .tif}, {@code .tiff} or {@code .csv}, as {@code inspect} takes them from a folder) is complete
 *
 * <ul>
 *   <li>at once when a marker {@code NAME.done} (e.g. {@code W07.tif.done}) or {@code STEM.done} ({@code W07.done})
 *       lies beside it: the writer says it has finished the map and its sidecar; or</li>
 *   <li>when its sidecar {@code STEM.json} is present (unless sidecars are not required) and the sizes and
 *       modification times of map and sidecar have stayed the same for the settle time.</li>
 * </ul>
 *
 * A map counts once: once complete (or {@linkplain #take taken} as inspected by an earlier run) it is never offered
 * again. Names starting with {@code .} (the temporaries of copying programs), the output folder, a batch's own
 * outputs and entries that are not regular files are left out. Empty files are never complete by settling.
 */
public final class Arrivals {
    /**
     * What one look at a map showed: its size and modification time, its sidecar's (size -1: no sidecar), and whether
     * a done marker lies beside it.
     */
    public record Look(long size, long modifiedNanos, long sidecarSize, long sidecarModifiedNanos, boolean done) {
        /** Whether {@code other} shows the same files (the marker is not compared). */
        boolean sameFiles(Look other) {
            return size == other.size && modifiedNanos == other.modifiedNanos && sidecarSize == other.sidecarSize
                    && sidecarModifiedNanos == other.sidecarModifiedNanos;
        }
    }

    /** A map seen unchanged since {@code sinceNanos}. */
    private record Pending(Look look, long sinceNanos) {
    }

    private final long settleNanos;
    private final boolean sidecarRequired;
    private final Map<Path, Pending> pending = new HashMap<>();
    private final Set<Path> taken = new HashSet<>();

    /**
     * @param settleNanos     how long size and time must stay the same, ns (≥ 0; 0: complete when first seen)
     * @param sidecarRequired whether a map without its sidecar waits (true) or may complete by settling alone
     */
    public Arrivals(long settleNanos, boolean sidecarRequired) {
        if (settleNanos < 0) {
            throw new IllegalArgumentException("settle time must be >= 0 ns but was " + settleNanos);
        }
        this.settleNanos = settleNanos;
        this.sidecarRequired = sidecarRequired;
    }

    /** Marks {@code map} as inspected already: it is never offered. */
    public void take(Path map) {
        taken.add(key(map));
    }

    /** Whether {@code map} was offered or taken. */
    public boolean taken(Path map) {
        return taken.contains(key(map));
    }

    /** Maps seen but not yet complete. */
    public int waiting() {
        return pending.size();
    }

    /**
     * Looks at the maps of {@code folder} (less {@code outDir} and batch outputs) at {@code nowNanos}
     * ({@link System#nanoTime}) and returns those that have become complete, by name.
     */
    public List<Path> scan(Path folder, Path outDir, long nowNanos) throws IOException {
        Path outAbs = outDir.toAbsolutePath().normalize();
        Map<Path, Look> looks = new LinkedHashMap<>();
        Set<String> names = new HashSet<>();
        List<Path> maps = new ArrayList<>();
        try (DirectoryStream<Path> entries = Files.newDirectoryStream(folder)) {
            for (Path p : entries) {
                String n = p.getFileName().toString();
                names.add(n);
                if (isMap(n) && !n.startsWith(".") && !BatchInspection.isOutputName(n)) {
                    maps.add(p);
                }
            }
        }
        for (Path p : maps) {
            Path k = key(p);
            if (taken.contains(k) || k.equals(outAbs)) {
                continue;
            }
            Look look = look(p, names);
            if (look != null) {
                looks.put(k, look);
            }
        }
        return update(looks, nowNanos);
    }

    /**
     * The maps of {@code looks} (by absolute path) that are complete at {@code nowNanos}, by name; forgets the
     * waiting maps not in {@code looks} (removed). The decision without the file system, for tests.
     */
    List<Path> update(Map<Path, Look> looks, long nowNanos) {
        pending.keySet().retainAll(looks.keySet());
        List<Path> complete = new ArrayList<>();
        for (Map.Entry<Path, Look> e : looks.entrySet()) {
            Path k = key(e.getKey());
            if (taken.contains(k)) {
                continue;
            }
            Look look = e.getValue();
            if (look.done()) {
                complete.add(k);
                continue;
            }
            if (look.size() <= 0 || sidecarRequired && look.sidecarSize() < 0) {
                pending.put(k, new Pending(look, nowNanos));
                continue;
            }
            Pending before = pending.get(k);
            if (before == null || !before.look().sameFiles(look)) {
                before = new Pending(look, nowNanos);
                pending.put(k, before);
            }
            if (nowNanos - before.sinceNanos() >= settleNanos) {
                complete.add(k);
            }
        }
        complete.sort((a, b) -> a.getFileName().toString().compareTo(b.getFileName().toString()));
        for (Path k : complete) {
            pending.remove(k);
            taken.add(k);
        }
        return complete;
    }

    /** The look at map {@code p}, or null when it is not a regular file (or vanished); {@code names}: the folder's. */
    private static Look look(Path p, Set<String> names) throws IOException {
        BasicFileAttributes a;
        try {
            a = Files.readAttributes(p, BasicFileAttributes.class);
        } catch (NoSuchFileException e) {
            return null; // removed, or a dangling link
        }
        if (!a.isRegularFile()) {
            return null;
        }
        String n = p.getFileName().toString();
        Path sidecar = MapFiles.sidecarOf(p);
        long sidecarSize = -1;
        long sidecarTime = -1;
        if (names.contains(sidecar.getFileName().toString())) {
            try {
                BasicFileAttributes s = Files.readAttributes(sidecar, BasicFileAttributes.class);
                if (s.isRegularFile()) {
                    sidecarSize = s.size();
                    sidecarTime = s.lastModifiedTime().to(java.util.concurrent.TimeUnit.NANOSECONDS);
                }
            } catch (NoSuchFileException e) {
                // removed meanwhile: no sidecar
            }
        }
        String stem = sidecar.getFileName().toString();
        stem = stem.substring(0, stem.length() - ".json".length());
        boolean done = names.contains(n + ".done") || names.contains(stem + ".done");
        return new Look(a.size(), a.lastModifiedTime().to(java.util.concurrent.TimeUnit.NANOSECONDS), sidecarSize,
                sidecarTime, done);
    }

    /** Whether {@code name} is a map's name as {@code inspect} takes maps from a folder. */
    static boolean isMap(String name) {
        String n = name.toLowerCase(Locale.ROOT);
        return n.endsWith(".tif") || n.endsWith(".tiff") || n.endsWith(".csv");
    }

    static Path key(Path p) {
        return p.toAbsolutePath().normalize();
    }
}
