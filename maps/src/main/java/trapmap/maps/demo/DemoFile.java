package trapmap.maps.demo;

import java.util.List;
import trapmap.maps.model.WaferMap;

/**
 * One map of the demonstration set.
 *
 * @param file        file name ({@code LOT-A01-W03.tif})
 * @param map         the map written to it
 * @param description one line for the README
 * @param defects     the defects planted in it
 */
public record DemoFile(String file, WaferMap map, String description, List<PlantedDefect> defects) {
    public DemoFile {
        defects = List.copyOf(defects);
    }

    /** The file's name without extension, also the name of its sidecar. */
    public String stem() {
        return file.substring(0, file.lastIndexOf('.'));
    }
}
