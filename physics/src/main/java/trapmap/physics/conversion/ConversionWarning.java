package trapmap.physics.conversion;

import java.util.EnumSet;
import java.util.Set;

/** Cautions that travel with a converted value. Each has one bit in warning rasters. */
public enum ConversionWarning {
    /**
     * N_t is not ≪ min(Δn, N_dop): the simplified SRH statistics (Δn = Δp) are not valid for this pixel
     * (Macdonald &amp; Cuevas, PRB 67, 075203 (2003)).
     */
    TRAP_DENSITY_NOT_SMALL("trap density not << min(injection, doping): simplified SRH statistics invalid"),
    /** τ_surf within a factor 2 of τ_eff: the result depends strongly on the surface recombination velocity. */
    SURFACE_LIMITED("surface-limited: surface lifetime within 2x of the effective lifetime"),
    /** T ≠ 300 K while the Richter 2012 intrinsic model was validated at 300 K only. */
    TEMPERATURE_NOT_300K("temperature differs from 300 K; the Richter 2012 intrinsic model is validated at 300 K"),
    /** Δn within a factor 2 of the Fe_i/FeB crossover: the iron signal vanishes there. */
    NEAR_IRON_CROSSOVER("injection within a factor 2 of the Fe_i/FeB crossover: iron signal vanishes"),
    /** The thermal velocities used differ from the convention the cross-sections were published with. */
    VELOCITY_CONVENTION("thermal velocities differ from the convention the cross-sections were published with"),
    /**
     * Δn &gt; 0.1·N_dop while the surface term uses the low-injection minority-carrier diffusivity (the ambipolar
     * diffusivity is lower at high injection, so τ_surf is then underestimated).
     */
    SURFACE_LOW_INJECTION_DIFFUSIVITY("injection above 0.1 x doping: the surface term uses the low-injection"
            + " minority-carrier diffusivity");

    private final String message;

    ConversionWarning(String message) {
        this.message = message;
    }

    public String message() {
        return message;
    }

    /** Bit of this warning in a warning mask. */
    public int bit() {
        return 1 << ordinal();
    }

    /** The warnings set in {@code mask}. */
    public static Set<ConversionWarning> fromMask(int mask) {
        Set<ConversionWarning> set = EnumSet.noneOf(ConversionWarning.class);
        for (ConversionWarning w : values()) {
            if ((mask & w.bit()) != 0) {
                set.add(w);
            }
        }
        return set;
    }
}
