package trapmap.physics.conversion;

import java.util.EnumSet;
import java.util.Set;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.ConductivityType;

/**
 * Cautions that travel with a converted value. The per-pixel ones have one bit in warning rasters; the ones that
 * depend only on the wafer's conditions and the defect ({@link #isWaferLevel()}) are reported once per conversion
 * (see {@code TrapDensityConverter.conditionWarnings()}) and never set in a mask. Per-pixel warnings come first:
 * their bits must fit the byte of a warning raster.
 */
public enum ConversionWarning {
    /**
     * N_t is not ≪ min(Δn, N_dop): the simplified SRH statistics (Δn = Δp) are not valid for this pixel
     * (Macdonald &amp; Cuevas, PRB 67, 075203 (2003)).
     */
    TRAP_DENSITY_NOT_SMALL("trap density not << min(injection, doping): simplified SRH statistics invalid"),
    /** τ_surf within a factor 2 of τ_eff: the result depends strongly on the surface recombination velocity. */
    SURFACE_LIMITED("surface-limited: surface lifetime within 2x of the effective lifetime"),
    /**
     * T outside 300 ± 3 K: the Richter 2012 intrinsic model was validated at 300 K only, and the defect
     * cross-sections are 300 K values whose temperature dependence is ignored.
     */
    TEMPERATURE_NOT_300K("temperature outside 300 +- 3 K; the Richter 2012 intrinsic model is validated at 300 K"
            + " and the defect cross-sections are 300 K values (their temperature dependence is ignored)"),
    /** Δn within a factor 2 of the Fe_i/FeB crossover: the iron signal vanishes there. */
    NEAR_IRON_CROSSOVER("injection within a factor 2 of the Fe_i/FeB crossover: iron signal vanishes"),
    /** The thermal velocities used differ from the convention the cross-sections were published with. */
    VELOCITY_CONVENTION("thermal velocities differ from the convention the cross-sections were published with"),
    /**
     * Δn &gt; 0.1·N_dop while the surface term uses the low-injection minority-carrier diffusivity (the ambipolar
     * diffusivity is lower at high injection, so τ_surf is then underestimated).
     */
    SURFACE_LOW_INJECTION_DIFFUSIVITY("injection above 0.1 x doping: the surface term uses the low-injection"
            + " minority-carrier diffusivity"),
    /** Wafer level: T outside the range the n_i temperature form was fitted over (e.g. 275–375 K). */
    TEMPERATURE_OUTSIDE_NI_FIT("temperature outside the range the intrinsic-density model's temperature form was"
            + " fitted over (275-375 K for the default)", true),
    /** Wafer level: doping above 1e18 cm^-3 with Boltzmann statistics, full ionisation, no band-gap narrowing. */
    DOPING_ABOVE_BOLTZMANN("doping above 1e18 cm^-3: Boltzmann statistics without band-gap narrowing and full"
            + " ionisation are used; the densities are approximate", true),
    /** Wafer level: T below 200 K, where dopants freeze out while full ionisation is assumed. */
    DOPANT_FREEZE_OUT("temperature below 200 K: dopant freeze-out is ignored (full ionisation assumed)", true),
    /** Wafer level: a defect of p-type silicon converted on an n-type map. */
    P_TYPE_DEFECT_ON_N_TYPE("the defect suits p-type silicon but the wafer is n-type; defects for n-type: "
            + String.join(", ", DefectLibrary.suitedFor(ConductivityType.N)), true),
    /** Wafer level: a defect of n-type silicon converted on a p-type map. */
    N_TYPE_DEFECT_ON_P_TYPE("the defect suits n-type silicon but the wafer is p-type; defects for p-type: "
            + String.join(", ", DefectLibrary.suitedFor(ConductivityType.P)), true);


    private final String message;
    private final boolean waferLevel;

    ConversionWarning(String message) {
        this(message, false);
    }

    ConversionWarning(String message, boolean waferLevel) {
        this.message = message;
        this.waferLevel = waferLevel;
    }

    public String message() {
        return message;
    }

    /** True for the warnings that depend only on the wafer's conditions and the defect (never in a mask). */
    public boolean isWaferLevel() {
        return waferLevel;
    }

    /** The wafer-type warning for {@code defect} on material of type {@code type}, or null when it suits. */
    public static ConversionWarning forType(trapmap.physics.defect.Defect defect, ConductivityType type) {
        DefectLibrary.Suitability s = DefectLibrary.suitability(defect);
        if (s.suits(type)) {
            return null;
        }
        return type == ConductivityType.N ? P_TYPE_DEFECT_ON_N_TYPE : N_TYPE_DEFECT_ON_P_TYPE;
    }

    /** Bit of this warning in a warning mask. */
    public int bit() {
        return 1 << ordinal();
    }

    /** The per-pixel warnings set in {@code mask}. */
    public static Set<ConversionWarning> fromMask(int mask) {
        Set<ConversionWarning> set = EnumSet.noneOf(ConversionWarning.class);
        for (ConversionWarning w : values()) {
            if (!w.waferLevel && (mask & w.bit()) != 0) {
                set.add(w);
            }
        }
        return set;
    }
}
