package trapmap.cli;

import java.nio.file.Path;
import picocli.CommandLine.Option;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.MapConversion;
import trapmap.physics.conversion.ConversionWarning;
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
        return apply(map, d, conditions, null);
    }

    /**
     * As {@link #apply(WaferMap, Defect, MapConditionOptions)}; the conversion's wafer-level warnings (validity
     * ranges, a defect that does not suit the wafer's conductivity type) go to {@code err} as {@code warning:}
     * lines (null: not shown).
     */
    static WaferMap apply(WaferMap map, Defect d, MapConditionOptions conditions, java.io.PrintWriter err) {
        if (d == null) {
            return map;
        }
        return convert(map, d, conditions, err).get(Quantity.TRAP_DENSITY);
    }

    /**
     * The conversion of {@code map} to the trap density of {@code d} (not null) only, with its status codes; wafer-level
     * warnings go to {@code err} as for {@link #apply(WaferMap, Defect, MapConditionOptions, java.io.PrintWriter)}.
     */
    static MapConversion.Result convert(WaferMap map, Defect d, MapConditionOptions conditions,
                                        java.io.PrintWriter err) {
        WaferMap withConditions = map.withConditions(conditions.applyTo(map.conditions()));
        MapConversion.Result r = MapConversion.convert(withConditions, d, conditions.settings(),
                java.util.EnumSet.of(Quantity.TRAP_DENSITY));
        if (err != null) {
            r.warnings().stream().filter(ConversionWarning::isWaferLevel).sorted()
                    .forEach(w -> err.println("warning: " + map.waferId() + ": " + w.name() + ": " + w.message()));
            err.flush();
        }
        return r;
    }
}
