package trapmap.cli;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.Collectors;
import trapmap.maps.io.DefectFileException;
import trapmap.maps.io.DefectFiles;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;

/** The defects a command can use: the built-in library, plus those of the user's {@code --defect-file}. */
final class DefectCatalog {
    private final List<Defect> builtIn;
    private final List<Defect> user;
    private final String userFile;

    private DefectCatalog(List<Defect> user, String userFile) {
        this.builtIn = DefectLibrary.all();
        this.user = List.copyOf(user);
        this.userFile = userFile;
    }

    /**
     * The built-in defects and those of {@code defectFile} (may be null).
     *
     * @throws InputException naming {@code --defect-file}, the file, field and unit when the file is unusable
     */
    static DefectCatalog load(Path defectFile) {
        if (defectFile == null) {
            return new DefectCatalog(List.of(), null);
        }
        try {
            return new DefectCatalog(DefectFiles.read(defectFile), defectFile.toString());
        } catch (DefectFileException e) {
            throw new InputException("--defect-file " + Flags.oneLine(e.getMessage()), e);
        }
    }

    List<Defect> builtIn() {
        return builtIn;
    }

    List<Defect> user() {
        return user;
    }

    /** Where {@code d} comes from: {@code built-in} or the defect file's name. */
    String origin(Defect d) {
        return user.contains(d) ? userFile : "built-in";
    }

    /**
     * The defect with this id (case-insensitive), given by {@code --defect}.
     *
     * @throws InputException listing the known ids when there is none
     */
    Defect find(String id) {
        return find("--defect", id);
    }

    /**
     * The defect with this id (case-insensitive), given by {@code option}.
     *
     * @throws InputException naming {@code option} and listing the known ids when there is none
     */
    Defect find(String option, String id) {
        String key = id.trim().toLowerCase(Locale.ROOT);
        List<Defect> all = new ArrayList<>(builtIn);
        all.addAll(user);
        for (Defect d : all) {
            if (d.id().equals(key)) {
                return d;
            }
        }
        String known = "built-in: " + ids(builtIn) + (user.isEmpty() ? "" : "; from " + userFile + ": " + ids(user));
        throw new InputException(option + " '" + id.trim() + "' is not a known defect id (" + known + ")");
    }

    private static String ids(List<Defect> defects) {
        return defects.stream().map(Defect::id).collect(Collectors.joining(", "));
    }
}
