package trapmap.maps.io;

import java.nio.file.Path;
import trapmap.maps.fuzz.FuzzContract;

/** The contract of the map readers' fuzz targets: maps, or a {@link MapFormatException} that is no safety net. */
final class MapReaderContract {
    /** Small limits so that a fuzzed header cannot ask for much memory within the limits. */
    static final ReadOptions OPTIONS = ReadOptions.DEFAULTS.withMaxPixels(1 << 20);

    private MapReaderContract() {
    }

    /** Reads {@code file}; a failure must name one of {@code named} in one line and not be the reader's net. */
    static void read(Path file, Path... named) {
        try {
            MapFiles.read(file, OPTIONS);
        } catch (MapFormatException e) {
            String p = e.problem();
            if (p.startsWith("unexpected failure while reading") || p.startsWith("not enough memory")) {
                throw new AssertionError(e.getMessage(), e); // the safety net of MapFiles.read caught a bug
            }
            FuzzContract.oneLineNamingFile(e, named);
        }
    }
}
