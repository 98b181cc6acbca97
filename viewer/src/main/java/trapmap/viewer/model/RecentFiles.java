package trapmap.viewer.model;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.prefs.Preferences;

/**
 * The most recently opened files and folders, newest first, at most {@link #LIMIT}; kept in a {@link Store}
 * (the user's preferences in the application).
 */
public final class RecentFiles {
    /** Longest list kept. */
    public static final int LIMIT = 10;
    private static final String KEY = "recent.";

    /** Where the list lives. */
    public interface Store {
        String get(String key);

        void put(String key, String value);

        void remove(String key);
    }

    private final Store store;

    public RecentFiles(Store store) {
        this.store = store;
    }

    /** Key of the flagged-pixel overlay preference in the same store. */
    private static final String OVERLAY_KEY = "flag-overlay";

    /** The flagged-pixel overlay last chosen ({@link FlagOverlay#DEFAULT} when none was). */
    public FlagOverlay flagOverlay() {
        return FlagOverlay.parse(store.get(OVERLAY_KEY));
    }

    /** Remembers the flagged-pixel overlay for the next start. */
    public void setFlagOverlay(FlagOverlay o) {
        store.put(OVERLAY_KEY, o.text());
    }

    /** A list kept in the user's preferences under {@code node}. */
    public static RecentFiles inPreferences(String node) {
        Preferences p = Preferences.userRoot().node(node);
        return new RecentFiles(new Store() {
            @Override
            public String get(String key) {
                return p.get(key, null);
            }

            @Override
            public void put(String key, String value) {
                p.put(key, value);
            }

            @Override
            public void remove(String key) {
                p.remove(key);
            }
        });
    }

    /** A list kept in memory only (sessions that must leave the user's preferences alone, tests). */
    public static RecentFiles inMemory() {
        java.util.Map<String, String> m = new java.util.concurrent.ConcurrentHashMap<>();
        return new RecentFiles(new Store() {
            @Override
            public String get(String key) {
                return m.get(key);
            }

            @Override
            public void put(String key, String value) {
                m.put(key, value);
            }

            @Override
            public void remove(String key) {
                m.remove(key);
            }
        });
    }

    /** The list, newest first. */
    public List<Path> list() {
        List<Path> out = new ArrayList<>();
        for (int i = 0; i < LIMIT; i++) {
            String v = store.get(KEY + i);
            if (v == null) {
                break;
            }
            out.add(Path.of(v));
        }
        return out;
    }

    /** Puts {@code path} first (moving it up if it was listed), dropping the oldest beyond the limit. */
    public void add(Path path) {
        Path abs = path.toAbsolutePath().normalize();
        List<Path> l = list();
        l.remove(abs);
        l.add(0, abs);
        save(l);
    }

    /** Takes {@code path} off the list (a file that has gone). */
    public void remove(Path path) {
        List<Path> l = list();
        l.remove(path.toAbsolutePath().normalize());
        save(l);
    }

    public void clear() {
        save(List.of());
    }

    private void save(List<Path> l) {
        for (int i = 0; i < LIMIT; i++) {
            if (i < l.size()) {
                store.put(KEY + i, l.get(i).toString());
            } else {
                store.remove(KEY + i);
            }
        }
    }
}
