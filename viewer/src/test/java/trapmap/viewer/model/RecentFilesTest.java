package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;
import org.junit.jupiter.api.Test;

class RecentFilesTest {
    private final Map<String, String> memory = new HashMap<>();
    private final RecentFiles recent = new RecentFiles(new RecentFiles.Store() {
        @Override
        public String get(String key) {
            return memory.get(key);
        }

        @Override
        public void put(String key, String value) {
            memory.put(key, value);
        }

        @Override
        public void remove(String key) {
            memory.remove(key);
        }
    });

    @Test
    void newestFirstWithoutDuplicates() {
        recent.add(Path.of("/a.tif"));
        recent.add(Path.of("/b.tif"));
        recent.add(Path.of("/a.tif"));
        assertThat(recent.list()).containsExactly(Path.of("/a.tif"), Path.of("/b.tif"));
    }

    @Test
    void keepsAtMostTheLimit() {
        for (int i = 0; i < RecentFiles.LIMIT + 5; i++) {
            recent.add(Path.of("/w" + i + ".tif"));
        }
        assertThat(recent.list()).hasSize(RecentFiles.LIMIT).first().isEqualTo(Path.of("/w14.tif"));
        assertThat(memory).hasSize(RecentFiles.LIMIT);
    }

    @Test
    void removeAndClear() {
        recent.add(Path.of("/a.tif"));
        recent.add(Path.of("/b.tif"));
        recent.remove(Path.of("/a.tif"));
        assertThat(recent.list()).containsExactly(Path.of("/b.tif"));
        recent.clear();
        assertThat(recent.list()).isEmpty();
        assertThat(memory).isEmpty();
    }
}
