package trapmap.viewer.model;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import trapmap.maps.io.DefectFileException;
import trapmap.maps.io.DefectFiles;
import trapmap.physics.defect.Defect;

/**
 * The New defect form as typed: the fields of a defect-file object (see {@code DefectSpecs}), turned into a
 * {@link Defect} by {@link DefectFiles#fromFields}, so the form accepts exactly what a defect file accepts and its
 * messages name the same field keys and units. An empty optional field takes the defect-file default: degeneracy 1,
 * thermal-velocity convention {@code fixed}, no spread (each range the nominal value), name = id.
 *
 * @param id            defect id
 * @param name          descriptive name (empty: the id)
 * @param reference     {@code Ev}, {@code Ec} or {@code Ei}
 * @param energyEv      level energy from the reference, eV
 * @param degeneracy    degeneracy factor g of the level (empty: 1)
 * @param sigmaNCm2     electron capture cross-section, cm²
 * @param sigmaPCm2     hole capture cross-section, cm²
 * @param vthConvention {@code fixed} or {@code green} (empty: fixed)
 * @param energySpread  min and max of the level energy, eV (both empty: none)
 * @param sigmaNSpread  min and max of σ_n, cm² (both empty: none)
 * @param sigmaPSpread  min and max of σ_p, cm² (both empty: none)
 * @param spreadNote    where the spread comes from (empty: none)
 * @param source        where the parameters come from
 */
public record DefectForm(String id, String name, String reference, String energyEv, String degeneracy,
                         String sigmaNCm2, String sigmaPCm2, String vthConvention, Spread energySpread,
                         Spread sigmaNSpread, Spread sigmaPSpread, String spreadNote, String source) {
    /** A spread as typed: its smallest and largest value (both empty: no spread). */
    public record Spread(String min, String max) {
        public static final Spread NONE = new Spread("", "");
    }

    /** What messages say the fields came from. */
    public static final String ORIGIN = "New defect";
    /** The defect-file default of the degeneracy factor. */
    public static final String DEFAULT_DEGENERACY = "1";
    /** The defect-file default of the thermal-velocity convention. */
    public static final String DEFAULT_VTH = "fixed";

    /** The defect, checked as a defect file's object is. */
    public Defect toDefect() throws DefectFileException {
        return DefectFiles.fromFields(fields(), ORIGIN);
    }

    /** The fields as a defect-file object: numbers where the text is one, the text otherwise, empty ones left out. */
    public Map<String, Object> fields() {
        Map<String, Object> m = new LinkedHashMap<>();
        put(m, "id", id, false);
        put(m, "name", name, false);
        put(m, "source", source, false);
        Map<String, Object> level = new LinkedHashMap<>();
        put(level, "reference", reference, false);
        put(level, "energy_ev", energyEv, true);
        put(level, "degeneracy", degeneracy, true);
        m.put("level", level);
        put(m, "sigma_n_cm2", sigmaNCm2, true);
        put(m, "sigma_p_cm2", sigmaPCm2, true);
        put(m, "vth_convention", vthConvention, false);
        Map<String, Object> spread = new LinkedHashMap<>();
        range(spread, "energy_ev", energySpread);
        range(spread, "sigma_n_cm2", sigmaNSpread);
        range(spread, "sigma_p_cm2", sigmaPSpread);
        if (!spread.isEmpty()) {
            put(spread, "note", spreadNote, false);
            m.put("spread", spread);
        }
        return m;
    }

    private static void range(Map<String, Object> m, String key, Spread s) {
        if (s == null || blank(s.min()) && blank(s.max())) {
            return;
        }
        List<Object> pair = new ArrayList<>(2);
        pair.add(value(s.min(), true));
        pair.add(value(s.max(), true));
        m.put(key, pair);
    }

    private static void put(Map<String, Object> m, String key, String text, boolean number) {
        if (!blank(text)) {
            m.put(key, value(text, number));
        }
    }

    /** A number where the text is a finite one (so that a typo reaches the defect checks as text), else the text. */
    private static Object value(String text, boolean number) {
        String t = text == null ? "" : text.trim();
        if (number) {
            try {
                double v = Double.parseDouble(t);
                if (Double.isFinite(v)) {
                    return v;
                }
            } catch (NumberFormatException e) {
                // left as text: the defect checks say the field must be a number in its unit
            }
        }
        return t;
    }

    private static boolean blank(String s) {
        return s == null || s.isBlank();
    }
}
