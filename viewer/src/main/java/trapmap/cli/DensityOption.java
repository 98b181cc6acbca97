package trapmap.cli;

import java.nio.file.Path;
import picocli.CommandLine.Option;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.MapConversion;
import trapmap.physics.defect.Defect;

/**
 * The optional {@code --defect} of commands that work on maps as read, or on their trap density when a defect is
 * named. The conversion uses each map's sidecar conditions overridden by the command's condition flags.
 */
final class DensityOption {
    @Option(names = "--defect", paramLabel = "<id>",
            description = "Convert the map(s) to this defect's trap density first (list ids with 'trapmap defects')."
                    + " Default: use the map(s) as read.")
    String defect;

    @Option(names = "--defect-file", paramLabel = "<file.json>", description = Help.DEFECT_FILE)
    Path defectFile;

    /** The named defect, or null when none was given. */
    Defect defectOrNull() {
        return defect == null ? null : DefectCatalog.load(defectFile).find(defect);
    }

    /** {@code map} as read when {@code d} is null, else its trap density of {@code d}. */
    static WaferMap apply(WaferMap map, Defect d, MapConditionOptions conditions) {
        if (d == null) {
            return map;
        }
        return convert(map, d, conditions).get(Quantity.TRAP_DENSITY);
    }

    /** The conversion of {@code map} to the trap density of {@code d} (not null), with its status map. */
    static MapConversion.Result convert(WaferMap map, Defect d, MapConditionOptions conditions) {
        WaferMap withConditions = map.withConditions(conditions.applyTo(map.conditions()));
        return MapConversion.convert(withConditions, d, conditions.settings());
    }
}
