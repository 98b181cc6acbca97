package trapmap.physics.defect;

import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * Builds a user-defined {@link Defect} from a parsed key–value description (for example a JSON object), validating
 * every field and naming field and unit in each error. Recognised keys:
 * <pre>
 * id (required), name, source (required: where the parameters come from),
 * level: { reference: "Ec" | "Ev" | "Ei", energy_ev: number, degeneracy: number (default 1) },
 * sigma_n_cm2, sigma_p_cm2 (required, cm²),
 * vth_convention: "fixed" (1.1e7 cm/s, default) | "green" (Green 1990),
 * spread: { energy_ev: [min, max], sigma_n_cm2: [min, max], sigma_p_cm2: [min, max] } (optional)
 * </pre>
 */
public final class DefectSpecs {
    private static final Set<String> KEYS = Set.of("id", "name", "source", "level", "sigma_n_cm2", "sigma_p_cm2",
            "vth_convention", "spread");
    private static final Set<String> LEVEL_KEYS = Set.of("reference", "energy_ev", "degeneracy");
    private static final Set<String> SPREAD_KEYS = Set.of("energy_ev", "sigma_n_cm2", "sigma_p_cm2", "note");

    private DefectSpecs() {
    }

    /**
     * @param spec   the parsed description
     * @param origin where it came from (file name), for messages
     */
    public static Defect fromMap(Map<String, ?> spec, String origin) {
        unknownKeys(spec, KEYS, origin, "");
        String id = text(spec, "id", "", origin, true);
        String name = text(spec, "name", "", origin, false);
        String source = text(spec, "source", "", origin, true);
        Object levelObj = spec.get("level");
        if (!(levelObj instanceof Map)) {
            throw error(origin, "level", "", "is required: an object with reference (Ec, Ev or Ei) and energy_ev");
        }
        @SuppressWarnings("unchecked")
        Map<String, ?> level = (Map<String, ?>) levelObj;
        unknownKeys(level, LEVEL_KEYS, origin, "level.");
        EnergyReference ref = reference(text(level, "reference", "level.", origin, true), origin);
        double energy = number(level, "energy_ev", "level.", "eV", origin, true, Double.NaN);
        double g = number(level, "degeneracy", "level.", "", origin, false, 1.0);
        double sn = number(spec, "sigma_n_cm2", "", "cm^2", origin, true, Double.NaN);
        double sp = number(spec, "sigma_p_cm2", "", "cm^2", origin, true, Double.NaN);
        String vth = text(spec, "vth_convention", "", origin, false);
        ThermalVelocityModel convention = vth == null ? ThermalVelocityModel.FIXED : velocity(vth, origin);
        try {
            TrapLevel trap = new TrapLevel(ref, energy, g);
            Checks.inRange(sn, Defect.MIN_CROSS_SECTION_CM2, Defect.MAX_CROSS_SECTION_CM2, "sigma_n_cm2", "cm^2");
            Checks.inRange(sp, Defect.MIN_CROSS_SECTION_CM2, Defect.MAX_CROSS_SECTION_CM2, "sigma_p_cm2", "cm^2");
            ParameterSpread spread = spread(spec.get("spread"), trap, sn, sp, origin);
            return Defect.of(id, name == null ? id : name, trap, sn, sp, convention, source, spread);
        } catch (InvalidValueException e) {
            String field = e.field().equals("energy") || e.field().equals("degeneracy") ? "level." + e.field()
                    + (e.field().equals("energy") ? "_ev" : "") : e.field();
            String m = e.getMessage();
            // the spread's own checks already start with the origin
            throw new InvalidValueException(field, e.unit(), m.startsWith(origin + ": ") ? m : origin + ": " + m);
        }
    }

    private static ParameterSpread spread(Object o, TrapLevel level, double sn, double sp, String origin) {
        double e = level.energyEv();
        if (o == null) {
            return new ParameterSpread(Range.of(e), Range.of(sn), Range.of(sp), "no spread given");
        }
        if (!(o instanceof Map)) {
            throw error(origin, "spread", "", "must be an object with energy_ev, sigma_n_cm2, sigma_p_cm2 ranges");
        }
        @SuppressWarnings("unchecked")
        Map<String, ?> m = (Map<String, ?>) o;
        unknownKeys(m, SPREAD_KEYS, origin, "spread.");
        boolean fromMidgap = level.reference() == EnergyReference.INTRINSIC;
        Range er = range(m, "energy_ev", "eV", e, fromMidgap ? -TrapLevel.MAX_ENERGY_EV / 2 : 0,
                fromMidgap ? TrapLevel.MAX_ENERGY_EV / 2 : TrapLevel.MAX_ENERGY_EV, origin);
        Range nr = range(m, "sigma_n_cm2", "cm^2", sn, Defect.MIN_CROSS_SECTION_CM2, Defect.MAX_CROSS_SECTION_CM2,
                origin);
        Range pr = range(m, "sigma_p_cm2", "cm^2", sp, Defect.MIN_CROSS_SECTION_CM2, Defect.MAX_CROSS_SECTION_CM2,
                origin);
        Object note = m.get("note");
        return new ParameterSpread(er, nr, pr, note == null ? "user-defined" : note.toString());
    }

    private static Range range(Map<String, ?> m, String key, String unit, double nominal, double lowest,
                               double highest, String origin) {
        Object v = m.get(key);
        if (v == null) {
            return Range.of(nominal);
        }
        if (!(v instanceof List) || ((List<?>) v).size() != 2
                || !(((List<?>) v).get(0) instanceof Number) || !(((List<?>) v).get(1) instanceof Number)) {
            throw error(origin, "spread." + key, unit, "must be a list of two numbers [min, max] in " + unit);
        }
        double lo = ((Number) ((List<?>) v).get(0)).doubleValue();
        double hi = ((Number) ((List<?>) v).get(1)).doubleValue();
        if (!(lo <= nominal && nominal <= hi)) {
            throw error(origin, "spread." + key, unit, "[" + lo + ", " + hi + "] " + unit
                    + " must contain the nominal value " + nominal);
        }
        if (!(lo >= lowest && hi <= highest)) {
            throw error(origin, "spread." + key, unit, "[" + lo + ", " + hi + "] " + unit + " must lie within ["
                    + lowest + ", " + highest + "] " + unit);
        }
        return new Range(lo, hi);
    }

    private static EnergyReference reference(String s, String origin) {
        switch (s.trim().toLowerCase(Locale.ROOT)) {
            case "ec": case "e_c": case "conduction": return EnergyReference.CONDUCTION_BAND;
            case "ev": case "e_v": case "valence": return EnergyReference.VALENCE_BAND;
            case "ei": case "e_i": case "intrinsic": return EnergyReference.INTRINSIC;
            default:
                throw error(origin, "level.reference", "", "'" + s + "' is not one of Ec, Ev, Ei");
        }
    }

    private static ThermalVelocityModel velocity(String s, String origin) {
        switch (s.trim().toLowerCase(Locale.ROOT)) {
            case "fixed": return ThermalVelocityModel.FIXED;
            case "green": return ThermalVelocityModel.GREEN_1990;
            default:
                throw error(origin, "vth_convention", "", "'" + s + "' is not one of fixed, green");
        }
    }

    private static void unknownKeys(Map<String, ?> m, Set<String> known, String origin, String prefix) {
        for (String k : m.keySet()) {
            if (!known.contains(k)) {
                throw error(origin, prefix + k, "", "is not a known field (known: " + String.join(", ",
                        new java.util.TreeSet<>(known)) + ")");
            }
        }
    }

    private static String text(Map<String, ?> m, String key, String prefix, String origin, boolean required) {
        Object v = m.get(key);
        if (v == null) {
            if (required) {
                throw error(origin, prefix + key, "", "is required");
            }
            return null;
        }
        if (!(v instanceof String) || ((String) v).isBlank()) {
            throw error(origin, prefix + key, "", "must be a non-empty text");
        }
        return (String) v;
    }

    private static double number(Map<String, ?> m, String key, String prefix, String unit, String origin,
                                 boolean required, double fallback) {
        Object v = m.get(key);
        if (v == null) {
            if (required) {
                throw error(origin, prefix + key, unit, "is required (a number in " + (unit.isEmpty() ? "no unit"
                        : unit) + ")");
            }
            return fallback;
        }
        if (!(v instanceof Number)) {
            throw error(origin, prefix + key, unit, "must be a number" + (unit.isEmpty() ? "" : " in " + unit)
                    + " but was '" + v + "'");
        }
        return ((Number) v).doubleValue();
    }

    private static InvalidValueException error(String origin, String field, String unit, String rule) {
        return new InvalidValueException(field, unit, origin + ": field '" + field + "' " + rule);
    }
}
