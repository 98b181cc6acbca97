package trapmap.viewer.ui.canvas;

import java.util.LinkedHashMap;
import java.util.Map;

/**
 * Least-recently-used cache of rendered tiles keyed by (level, tile column, tile row), bounded by the memory of the
 * cached pixels. Used on the Event Dispatch Thread only.
 *
 * @param <T> tile type
 */
final class TileCache<T> {
    private final long maxBytes;
    private long bytes;
    private final LinkedHashMap<Long, Entry<T>> map = new LinkedHashMap<>(64, 0.75f, true);

    private record Entry<T>(T tile, long bytes) {
    }

    TileCache(long maxBytes) {
        this.maxBytes = maxBytes;
    }

    static long key(int level, int tx, int ty) {
        return ((long) level << 48) | ((long) tx << 24) | ty;
    }

    /** The cached tile, or null. A cached null-content tile is stored as {@code empty} by the caller. */
    T get(long key) {
        Entry<T> e = map.get(key);
        return e == null ? null : e.tile();
    }

    void put(long key, T tile, long tileBytes) {
        Entry<T> old = map.put(key, new Entry<>(tile, tileBytes));
        if (old != null) {
            bytes -= old.bytes();
        }
        bytes += tileBytes;
        var it = map.entrySet().iterator();
        while (bytes > maxBytes && map.size() > 1 && it.hasNext()) {
            Map.Entry<Long, Entry<T>> eldest = it.next();
            if (eldest.getKey() == key) {
                continue;
            }
            bytes -= eldest.getValue().bytes();
            it.remove();
        }
    }

    void clear() {
        map.clear();
        bytes = 0;
    }

    int size() {
        return map.size();
    }

    long bytes() {
        return bytes;
    }
}
