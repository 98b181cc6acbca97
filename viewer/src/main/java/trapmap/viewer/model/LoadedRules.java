package trapmap.viewer.model;

import java.nio.file.Path;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RulesException;
import trapmap.maps.batch.WaferInspection;

/**
 * A rules file loaded into the viewer: where it came from, the rules, and the batch's inspection engine built on
 * them, which judges every open wafer.
 *
 * @param file       the rules file (absolute)
 * @param rules      its rules
 * @param inspection the engine that judges by them
 */
public record LoadedRules(Path file, Rules rules, WaferInspection inspection) {
    /**
     * Reads and checks a rules file.
     *
     * @throws RulesException with one line naming the file, the field and its unit when the file is not valid
     */
    public static LoadedRules read(Path file) throws RulesException {
        Path abs = file.toAbsolutePath().normalize();
        Rules rules = Rules.read(abs);
        return new LoadedRules(abs, rules, new WaferInspection(rules));
    }

    /** The same file judged with other physics settings (they replace the file's physics block). */
    public LoadedRules withPhysics(trapmap.physics.conversion.PhysicsSettings p) {
        Rules r = rules.withPhysics(p);
        return new LoadedRules(file, r, new WaferInspection(r));
    }

    /** The file's name, as the verdicts name it. */
    public String name() {
        return file.getFileName().toString();
    }
}
