package trapmap.viewer.model;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import trapmap.maps.io.DefectFiles;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;

/** The defects the user can choose: the library's with absolute cross-sections, then user-defined ones. */
public final class DefectChoices {
    private final Map<String, Defect> user = new LinkedHashMap<>();

    /** Library defects that give a trap density (those with absolute capture cross-sections). */
    public static List<Defect> library() {
        return DefectLibrary.all().stream().filter(Defect::hasAbsoluteCrossSections).toList();
    }

    /** Library then user-defined defects. */
    public List<Defect> all() {
        List<Defect> all = new ArrayList<>(library());
        all.addAll(user.values());
        return all;
    }

    public List<Defect> userDefined() {
        return List.copyOf(user.values());
    }

    /**
     * The defect with this id, or null when there is none.
     */
    public Defect byId(String id) {
        if (id == null) {
            return null;
        }
        Defect d = user.get(id);
        if (d != null) {
            return d;
        }
        for (Defect l : library()) {
            if (l.id().equals(id)) {
                return l;
            }
        }
        return null;
    }

    /**
     * Adds a user-defined defect (replacing one of the same id).
     *
     * @throws IllegalArgumentException when the id is a library defect's
     */
    public void add(Defect d) {
        for (Defect l : DefectLibrary.all()) {
            if (l.id().equals(d.id())) {
                throw new IllegalArgumentException("defect id '" + d.id() + "' is a library defect; choose another");
            }
        }
        user.put(d.id(), d);
    }

    /** Reads the defects of a JSON file ({@link DefectFiles}) and adds them; returns them. */
    public List<Defect> addFile(Path file) throws IOException {
        List<Defect> read = DefectFiles.read(file);
        read.forEach(this::add);
        return read;
    }

    public void clearUserDefined() {
        user.clear();
    }
}
