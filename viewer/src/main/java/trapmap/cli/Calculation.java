package trapmap.cli;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PixelResult;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.Surface;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.IntrinsicLifetime;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.physics.recombination.SurfaceModel;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.units.Units;

/**
 * One {@code calc} case: effective lifetime → equivalent trap density of one defect, with everything the conversion
 * used. The result is an ordered map from snake_case field names to numbers (null for infinite or not applicable),
 * text or lists of text; the same map is printed as JSON, as a table, or as one cases-file row.
 */
final class Calculation {
    static final String CAUTION = trapmap.maps.model.Caution.TEXT;
    static final double DEFAULT_TEMPERATURE_K = 300;

    /** Every result field, in output order. */
    static final List<String> FIELDS = List.of("status", "trap_density_cm3", "trap_density_min_cm3",
            "trap_density_max_cm3", "trap_density_is_upper_bound", "occupancy", "occupied_density_cm3",
            "tau_effective_us", "tau_srh_us", "tau_intrinsic_us", "tau_surface_us", "lifetime_at_reference_us",
            "reference_injection_cm3", "injection_cm3", "generation_cm3_s", "n0_cm3", "p0_cm3", "n1_cm3", "p1_cm3",
            "doping_type", "doping_cm3", "resistivity_ohm_cm", "temperature_k", "surface", "vth_model", "defect",
            "defect_name", "defect_level", "defect_source", "defect_origin", "intrinsic_model", "physics", "warnings",
            "warning_codes", "caution");

    /** Fields left out of a JSON answer when they do not apply (null). */
    static final Set<String> OPTIONAL = Set.of("lifetime_at_reference_us", "reference_injection_cm3",
            "generation_cm3_s", "resistivity_ohm_cm");

    private Calculation() {
    }

    /**
     * Converts one case.
     *
     * @throws InputException          for missing or contradictory inputs and unknown defects
     * @throws InvalidValueException   for values outside the physics' ranges (mapped to flags by the caller)
     */
    static Map<String, Object> run(CalcRequest q, DefectCatalog catalog) {
        return run(q, catalog, PhysicsSettings.DEFAULTS);
    }

    /**
     * Converts one case with the given physics settings ({@code --physics}); the case's own vth and surface model
     * override theirs.
     */
    static Map<String, Object> run(CalcRequest q, DefectCatalog catalog, PhysicsSettings physics) {
        if (q.lifetimeUs() == null) {
            throw Flags.required("--lifetime-us");
        }
        if (q.doping() == null) {
            throw Flags.required("--doping");
        }
        if (q.injectionCm3() == null && q.generationCm3PerS() == null) {
            throw new InputException("--injection (Δn in cm^-3) or --generation (G in cm^-3 s^-1) is required");
        }
        if (q.injectionCm3() != null && q.generationCm3PerS() != null) {
            throw new InputException("--injection and --generation exclude each other: give Δn (cm^-3) or G"
                    + " (cm^-3 s^-1), not both");
        }
        if (q.defect() == null) {
            throw Flags.required("--defect");
        }
        if (q.srvCmPerS() != null && q.thicknessUm() == null) {
            throw new InputException("--srv needs --thickness-um (wafer thickness in µm) for the surface term");
        }
        Defect defect = catalog.find(q.defect());
        if (!defect.hasAbsoluteCrossSections()) {
            try {
                defect.requireAbsoluteCrossSections();
            } catch (InvalidValueException e) {
                throw new InputException(Flags.message(e) + "; compute that with 'trapmap calc bo'", e);
            }
        }
        double temperature = q.temperatureK() == null ? DEFAULT_TEMPERATURE_K : q.temperatureK();
        ThermalVelocityModel vth = q.vth() == null ? physics.velocities() : q.vth();
        SurfaceModel model = q.surfaceModel() == null ? physics.surfaceModel() : q.surfaceModel();
        PhysicsSettings used = physics.withVelocities(vth).withSurfaceModel(model);
        Silicon silicon = used.silicon(temperature);
        Surface surface = q.thicknessUm() == null ? Surface.IDEAL
                : new Surface(q.thicknessUm(), q.srvCmPerS() == null ? 0 : q.srvCmPerS(), model);
        Injection injection = q.injectionCm3() != null ? Injection.fixed(q.injectionCm3())
                : Injection.generation(q.generationCm3PerS());
        if (q.generationCm3PerS() != null) {
            checkSteadyStateInjection(q.generationCm3PerS(), q.lifetimeUs());
        }
        double reference = q.referenceInjectionCm3() == null ? Double.NaN : q.referenceInjectionCm3();
        Conditions conditions = new Conditions(q.doping().doping(), silicon, injection, surface,
                used.radiativeCm3PerS(), used.detectionResolution(), reference);
        TrapDensityConverter converter = new TrapDensityConverter(conditions, defect);
        PixelResult r = converter.convert(q.lifetimeUs());
        SrhRecombination srh = converter.srh();

        List<String> warnings = Output.warningMessages(r.warnings());
        List<String> codes = Output.warningCodes(r.warnings());

        Map<String, Object> m = new LinkedHashMap<>();
        m.put("status", r.status().name());
        m.put("trap_density_cm3", Output.num(r.trapDensityPerCm3()));
        m.put("trap_density_min_cm3", Output.num(r.trapDensityMinPerCm3()));
        m.put("trap_density_max_cm3", Output.num(r.trapDensityMaxPerCm3()));
        m.put("trap_density_is_upper_bound", r.status() == PixelStatus.BELOW_LIMIT);
        m.put("occupancy", Output.num(r.occupancy()));
        m.put("occupied_density_cm3", Output.num(r.occupiedDensityPerCm3()));
        m.put("tau_effective_us", Output.num(r.effectiveLifetimeUs()));
        m.put("tau_srh_us", Output.num(r.srhLifetimeUs()));
        m.put("tau_intrinsic_us", Output.num(r.intrinsicLifetimeUs()));
        m.put("tau_surface_us", Output.num(r.surfaceLifetimeUs()));
        m.put("lifetime_at_reference_us", Output.num(r.lifetimeAtReferenceUs()));
        m.put("reference_injection_cm3", q.referenceInjectionCm3());
        m.put("injection_cm3", Output.num(r.injectionPerCm3()));
        m.put("generation_cm3_s", q.generationCm3PerS());
        m.put("n0_cm3", Output.num(srh.n0PerCm3()));
        m.put("p0_cm3", Output.num(srh.p0PerCm3()));
        m.put("n1_cm3", Output.num(srh.n1PerCm3()));
        m.put("p1_cm3", Output.num(srh.p1PerCm3()));
        m.put("doping_type", q.doping().typeLetter());
        m.put("doping_cm3", q.doping().doping().densityPerCm3());
        m.put("resistivity_ohm_cm", q.doping().fromResistivity() ? q.doping().resistivityOhmCm() : null);
        m.put("temperature_k", temperature);
        m.put("surface", describe(surface));
        m.put("vth_model", Choices.vthName(vth));
        m.put("defect", defect.id());
        m.put("defect_name", defect.name());
        m.put("defect_level", defect.level().toString());
        m.put("defect_source", defect.source());
        m.put("defect_origin", catalog.origin(defect));
        m.put("intrinsic_model", IntrinsicLifetime.SOURCE);
        m.put("physics", used.oneLine());
        m.put("warnings", List.copyOf(warnings));
        m.put("warning_codes", List.copyOf(codes));
        m.put("caution", CAUTION);
        assert m.keySet().equals(new java.util.LinkedHashSet<>(FIELDS)) : m.keySet();
        return m;
    }

    /** Δn = G·τ_eff must lie in the range accepted for a fixed injection. */
    private static void checkSteadyStateInjection(double generation, double lifetimeUs) {
        double dn = generation * lifetimeUs * Units.S_PER_US;
        try {
            Injection.fixed(dn);
        } catch (InvalidValueException e) {
            String rule = Flags.message(e).replaceFirst("^--injection ", "").replaceFirst(" \\(got [^)]*\\)$", "");
            throw new InputException("--generation " + Format.exact(generation) + " cm^-3 s^-1 with --lifetime-us "
                    + Format.exact(lifetimeUs) + " µs gives Δn = G·τ_eff = " + Format.number(dn) + " cm^-3, but Δn "
                    + rule, e);
        }
    }

    /** The result without the optional fields that do not apply, for a JSON answer. */
    static Map<String, Object> forJson(Map<String, Object> result) {
        Map<String, Object> m = new LinkedHashMap<>(result);
        m.entrySet().removeIf(e -> OPTIONAL.contains(e.getKey()) && e.getValue() == null);
        return m;
    }

    /** The result as an aligned table with units. */
    static String table(Map<String, Object> m) {
        boolean bound = Boolean.TRUE.equals(m.get("trap_density_is_upper_bound"));
        Output.Table t = new Output.Table();
        t.row("status", bound ? m.get("status") + " (below the detection limit)" : (String) m.get("status"), "");
        t.row("defect", m.get("defect") + " — " + m.get("defect_name") + ", " + m.get("defect_level"), "");
        String density = Format.number(((Number) m.get("trap_density_cm3")).doubleValue());
        t.row(bound ? "trap density N_t (upper bound)" : "trap density N_t", bound ? "<= " + density : density,
                "cm^-3");
        t.number(m, "trap_density_min_cm3", "  lowest over published spread", "cm^-3", null);
        t.number(m, "trap_density_max_cm3", "  highest over published spread", "cm^-3", null);
        t.number(m, "occupancy", "trap occupancy f_t", "", null);
        t.number(m, "occupied_density_cm3", "occupied traps f_t·N_t", "cm^-3", null);
        t.number(m, "tau_effective_us", "effective lifetime τ_eff", "µs", null);
        t.number(m, "tau_srh_us", "SRH lifetime τ_SRH", "µs", "infinite (no SRH recombination detectable)");
        t.number(m, "tau_intrinsic_us", "intrinsic lifetime τ_intr", "µs", null);
        t.number(m, "tau_surface_us", "surface lifetime τ_surf", "µs", "infinite (no surface term)");
        if (m.get("reference_injection_cm3") != null) {
            t.number(m, "lifetime_at_reference_us", "lifetime at Δn = "
                    + Format.number(((Number) m.get("reference_injection_cm3")).doubleValue()) + " cm^-3", "µs", null);
        }
        t.number(m, "injection_cm3", "injection Δn", "cm^-3", null);
        t.number(m, "generation_cm3_s", "generation G", "cm^-3 s^-1", null);
        t.row("doping", m.get("doping_type") + "-type " + Format.number(((Number) m.get("doping_cm3")).doubleValue()),
                "cm^-3");
        t.number(m, "resistivity_ohm_cm", "  from resistivity (ASTM F723)", "Ω·cm", null);
        t.number(m, "n0_cm3", "equilibrium electrons n0", "cm^-3", null);
        t.number(m, "p0_cm3", "equilibrium holes p0", "cm^-3", null);
        t.number(m, "n1_cm3", "SRH density n1", "cm^-3", null);
        t.number(m, "p1_cm3", "SRH density p1", "cm^-3", null);
        t.number(m, "temperature_k", "temperature", "K", null);
        t.row("surface", (String) m.get("surface"), "");
        t.row("thermal velocity", (String) m.get("vth_model"), "");
        t.row("defect source", m.get("defect_source") + " (" + m.get("defect_origin") + ")", "");
        t.row("intrinsic model", (String) m.get("intrinsic_model"), "");
        t.row("physics settings", (String) m.get("physics"), "");
        @SuppressWarnings("unchecked")
        List<String> warnings = (List<String>) m.get("warnings");
        for (String w : warnings) {
            t.note("warning: " + w);
        }
        t.note("caution: " + m.get("caution"));
        return t.render();
    }

    private static String describe(Surface s) {
        if (s.ideal()) {
            return "ideal (no surface term)";
        }
        return (s.model() == SurfaceModel.EXACT ? "exact" : "sproul") + ", W = " + Format.number(s.thicknessUm())
                + " µm, S = " + Format.number(s.srvCmPerS()) + " cm/s on both surfaces";
    }
}
