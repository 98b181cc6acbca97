package trapmap.physics.defect;

import static trapmap.physics.material.ThermalVelocityModel.FIXED;

import java.util.EnumSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.shared.error.InvalidValueException;

/**
 * The built-in defect library: the default parameter set of each defect with its source, and the published spread
 * of each parameter (the alternatives in the literature) for the density bounds. Cross-sections that are published
 * with a temperature dependence are evaluated at 300 K for the spread. All cross-sections belong to the
 * 1.1e7 cm/s thermal-velocity convention unless stated.
 * <p>
 * Validity range: the cross-sections are 300 K values; their temperature dependence is ignored, so a conversion
 * away from 300 K (outside the band of {@code IntrinsicLifetime.TEMPERATURE_TOLERANCE_K}) carries the
 * temperature warning. Each defect also states the conductivity types it suits ({@link #suitedTypes}): the types
 * of material its level and cross-sections were measured in and where it forms; converting a map of another type
 * carries {@code ConversionWarning.P_TYPE_DEFECT_ON_N_TYPE} or {@code N_TYPE_DEFECT_ON_P_TYPE}.
 */
public final class DefectLibrary {
    private static final double KT300 = 8.617333262e-5 * 300;

    private static final Map<String, Defect> BUILT_IN = new LinkedHashMap<>();
    /** Conductivity types each built-in defect suits, with the reason (see {@link #suitability}). */
    private static final Map<String, Suitability> SUITED = new LinkedHashMap<>();

    /**
     * The conductivity types a defect suits and why.
     *
     * @param types  the types (both for a defect of unknown or either type)
     * @param reason one line: where the defect forms and where its parameters were measured
     */
    public record Suitability(Set<ConductivityType> types, String reason) {
        public Suitability {
            types = Set.copyOf(types);
        }

        /** True when the defect suits material of type {@code t}. */
        public boolean suits(ConductivityType t) {
            return types.contains(t);
        }

        /** "p-type", "n-type" or "p- and n-type". */
        public String label() {
            if (types.size() == 2) {
                return "p- and n-type";
            }
            return types.contains(ConductivityType.P) ? "p-type" : "n-type";
        }
    }

    private static final Set<ConductivityType> P = EnumSet.of(ConductivityType.P);
    private static final Set<ConductivityType> N = EnumSet.of(ConductivityType.N);
    private static final Set<ConductivityType> BOTH = EnumSet.allOf(ConductivityType.class);

    static {
        SUITED.put("fe-i", new Suitability(P, "Fe_i+ pairs with boron and its cross-sections were measured in p-type"
                + " silicon; in n-type Fe_i is neutral and its recombination differs"));
        SUITED.put("fe-b", new Suitability(P, "iron-boron pairs form only in boron-doped p-type silicon"));
        SUITED.put("cr-i", new Suitability(BOTH, "interstitial chromium is recombination-active in n- and p-type"
                + " silicon (Schmidt et al. 2007)"));
        SUITED.put("cr-b", new Suitability(P, "chromium-boron pairs form only in boron-doped p-type silicon"));
        SUITED.put("ti-i", new Suitability(P, "parameters from lifetime spectroscopy on p-type silicon (Rein 2005)"));
        SUITED.put("mo-i", new Suitability(P, "parameters from lifetime spectroscopy on p-type silicon (Rein 2005)"));
        SUITED.put("au-a", new Suitability(N, "the gold acceptor level governs recombination in n-type silicon"));
        SUITED.put("au-d", new Suitability(P, "the gold donor level governs recombination in p-type silicon"));
        SUITED.put("ni-s", new Suitability(P, "parameters from lifetime spectroscopy on p-type silicon (Rein 2005)"));
        SUITED.put("midgap", new Suitability(BOTH, "a generic reference level for either type"));
        SUITED.put("bo-lid", new Suitability(P, "the boron-oxygen centre needs boron: p-type silicon"));
    }

    static {
        add(Defect.of("fe-i", "interstitial iron (donor)", TrapLevel.aboveValenceBand(0.38), 1.3e-14, 7e-17, FIXED,
                "level: Istratov et al., Appl. Phys. A 69, 13 (1999); sigma: Macdonald, Tan & Trupke, JAP 103,"
                        + " 073710 (2008)",
                new ParameterSpread(new Range(0.38, 0.399),
                        new Range(9.1e-15 * Math.exp(-0.024 / KT300), 5e-14),
                        new Range(4.54e-16 * Math.exp(-0.05 / KT300), 7e-17),
                        "E_v+0.38 (Istratov 1999) to E_v+0.394+-0.005 (Rein & Glunz 2005); sigma_n 9.1e-15"
                                + "*exp(-0.024/kT) (Rein & Glunz 2005) to 5e-14 (Macdonald et al. 2004); sigma_p"
                                + " 4.54e-16*exp(-0.05/kT) (Paudyal 2009) to 7e-17")));
        add(Defect.of("fe-b", "iron-boron pair (acceptor level)", TrapLevel.belowConductionBand(0.26), 5e-15, 3e-15,
                FIXED, "Macdonald, Roth, Deenapanray, Trupke & Bardos, APL 89, 142107 (2006)",
                new ParameterSpread(new Range(0.23, 0.26), new Range(2.5e-15, 3e-14), new Range(1.1e-15, 5.5e-15),
                        "E_c-0.23 (Macdonald 2001) to E_c-0.26; sigma_n 2.5e-15 (Rein & Glunz 2005) to 3e-14"
                                + " (Macdonald 2001); sigma_p 1.1e-15 (Birkholz 2005) to 5.5e-15 (Rein & Glunz"
                                + " 2005)")));
        add(Defect.of("cr-i", "interstitial chromium (donor)", TrapLevel.belowConductionBand(0.24), 2e-14, 4e-15,
                FIXED, "Schmidt et al., JAP 102, 123701 (2007)",
                new ParameterSpread(Range.of(0.24), new Range(2e-14, 2.4e-14), new Range(4e-15, 2.4e-14 / 2.6),
                        "sigma_n 2e-14 (Schmidt 2007) to 2.4e-14 (Sun, Rougieux & Macdonald 2014); sigma_p 4e-15"
                                + " to sigma_n/k with k = 3.2 (-0.6) (Sun 2014)")));
        add(Defect.of("cr-b", "chromium-boron pair (donor)", TrapLevel.aboveValenceBand(0.28), 5e-15, 1e-14, FIXED,
                "Schmidt et al., JAP 102, 123701 (2007)",
                new ParameterSpread(new Range(0.27, 0.28), new Range(5e-15, 3.8e-14), new Range(7e-15, 1e-14),
                        "E_v+0.27 (Sun 2014) to E_v+0.28; sigma_n 5e-15 to 3.8e-14 (Sun 2014), sigma_p 0.7e-14"
                                + " (Sun 2014) to 1e-14; the published k differ by ~10x: uncertain")));
        add(Defect.of("ti-i", "interstitial titanium (double donor, p-type)", TrapLevel.aboveValenceBand(0.29),
                12 * 1.9e-16, 1.9e-16, FIXED, "Rein, Lifetime Spectroscopy, Springer (2005), k = 12",
                new ParameterSpread(new Range(0.255, 0.294),
                        new Range(9.01e-14 * Math.exp(-0.107 / KT300), 1.3e-14),
                        new Range(1.09e-16 * Math.exp(-0.027 / KT300), 1.9e-16),
                        "E_v+0.255 (Wang 1984) to E_v+0.289+-0.005 (Rein 2005); sigma_n 9.01e-14*exp(-0.107/kT)"
                                + " (Paudyal 2009) to 1.3e-14 (Wang 1984); sigma_p 1.09e-16*exp(-0.027/kT) (Wang"
                                + " 1984) to 1.9e-16")));
        add(Defect.of("mo-i", "interstitial molybdenum (donor)", TrapLevel.aboveValenceBand(0.32), 7.8e-15, 6e-16,
                FIXED, "Rein, Lifetime Spectroscopy, Springer (2005), k = 13",
                new ParameterSpread(new Range(0.312, 0.405), new Range(2e-15, 7.8e-15), new Range(1.35e-16, 7.8e-16),
                        "E_v+0.317+-0.005 (Rein 2005) to E_v+0.375+-0.03 (Paudyal 2010); sigma_n 2e-15 (Paudyal"
                                + " 2010) to 7.8e-15; sigma_p 1.35e-16 (Paudyal 2010) to sigma_n/k with k = 13-3")));
        add(Defect.of("au-a", "substitutional gold, acceptor level (n-type)", TrapLevel.belowConductionBand(0.55),
                1.4e-16, 7.6e-15, FIXED, "Graff, Metal Impurities in Silicon-Device Fabrication, Springer (2000)",
                new ParameterSpread(new Range(0.54, 0.56), Range.of(1.4e-16), Range.of(7.6e-15),
                        "DLTS levels E_c-0.55+-0.01; no alternative cross-sections tabulated")));
        add(Defect.of("au-d", "substitutional gold, donor level (p-type)", TrapLevel.aboveValenceBand(0.35), 1.9e-15,
                2.7e-15, FIXED, "Graff (2000) for sigma_n; Dubois et al., JAP 100, 123502 (2006) for sigma_p",
                new ParameterSpread(Range.of(0.35), Range.of(1.9e-15), Range.of(2.7e-15),
                        "no alternative values tabulated")));
        add(Defect.of("ni-s", "substitutional nickel (p-type)", TrapLevel.belowConductionBand(0.40), 5.6e-17, 8e-17,
                FIXED, "Rein, Lifetime Spectroscopy, Springer (2005)",
                new ParameterSpread(new Range(0.37, 0.43), Range.of(5.6e-17), new Range(5.6e-17 / 1.1, 5.6e-17 / 0.3),
                        "E_c-0.40+-0.03; k = 0.7+-0.4 (Rein 2005) gives sigma_p = sigma_n/k")));
        add(Defect.of("midgap", "generic mid-gap reference level", TrapLevel.fromIntrinsic(0), 1e-15, 1e-15, FIXED,
                "generic reference level (common practice)",
                new ParameterSpread(Range.of(0), Range.of(1e-15), Range.of(1e-15), "reference level: no spread")));
        add(new Defect("bo-lid", "boron-oxygen light-induced degradation centre", TrapLevel.belowConductionBand(0.41),
                Double.NaN, Double.NaN, 9.3, FIXED,
                "Rein & Glunz, APL 82, 1054 (2003); normalised density after Bothe & Schmidt, JAP 99, 013701 (2006)",
                null));
    }

    private DefectLibrary() {
    }

    private static void add(Defect d) {
        BUILT_IN.put(d.id(), d);
    }

    /** All built-in defects in library order. */
    public static List<Defect> all() {
        return List.copyOf(BUILT_IN.values());
    }

    /**
     * The built-in defect with this id.
     *
     * @throws InvalidValueException naming the known ids when there is none
     */
    public static Defect byId(String id) {
        Defect d = BUILT_IN.get(id == null ? "" : id.trim().toLowerCase(java.util.Locale.ROOT));
        if (d == null) {
            throw new InvalidValueException("defect", "", "unknown defect '" + id + "' (known: "
                    + String.join(", ", BUILT_IN.keySet()) + ")");
        }
        return d;
    }

    /**
     * The conductivity types {@code d} suits: the library's statement for a built-in defect (matched by id and
     * parameters), both types for a defect of the user's.
     */
    public static Suitability suitability(Defect d) {
        Suitability s = d == null ? null : SUITED.get(d.id());
        // the library's own instance needs no comparison (a record's first equals costs milliseconds of linking)
        if (s == null || (d != BUILT_IN.get(d.id()) && !d.equals(BUILT_IN.get(d.id())))) {
            return new Suitability(BOTH, "user-defined defect: its conductivity type is not known");
        }
        return s;
    }

    /** The conductivity types a built-in defect suits (both for a defect of the user's). */
    public static Set<ConductivityType> suitedTypes(Defect d) {
        return suitability(d).types();
    }

    /** The ids of the built-in defects that suit material of type {@code t} and give a density, in library order. */
    public static List<String> suitedFor(ConductivityType t) {
        return BUILT_IN.values().stream().filter(Defect::hasAbsoluteCrossSections)
                .filter(d -> SUITED.get(d.id()).suits(t)).map(Defect::id).toList();
    }

    /** The thermal-velocity convention of the built-in cross-sections. */
    public static ThermalVelocityModel defaultConvention() {
        return FIXED;
    }
}
