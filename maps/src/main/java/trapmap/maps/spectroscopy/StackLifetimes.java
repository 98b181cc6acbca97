package trapmap.maps.spectroscopy;

import java.util.ArrayList;
import java.util.EnumSet;
import java.util.List;
import java.util.Set;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.defect.Defect;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.shared.check.Checks;

/**
 * τ_SRH and Δn of every pixel at every level of an {@link InjectionStack}, from the map conversion
 * ({@link MapConversion}): τ_SRH = 1/(1/τ_eff − 1/τ_intr − 1/τ_surf) with intrinsic and surface recombination at the
 * pixel's Δn removed; with a fixed generation rate G the pixel's Δn = G·τ_eff. Neither depends on the defect the
 * conversion is made for. A pixel whose SRH share is below the conversion's detection resolution has τ_SRH = +∞
 * (below the limit), one without data or with an invalid lifetime NaN.
 */
public final class StackLifetimes {
    private final InjectionStack stack;
    private final ConversionSettings settings;
    private final Doping doping;
    private final Silicon silicon;
    /** Per level, τ_SRH per pixel, µs. */
    private final float[][] tauSrhUs;
    /** Per level, Δn per pixel, cm^-3. */
    private final float[][] injectionCm3;
    /** Per level, τ_eff per pixel, µs (from PL counts for a PL map). */
    private final float[][] effectiveUs;
    private final List<Set<ConversionWarning>> warnings;

    private StackLifetimes(InjectionStack stack, ConversionSettings settings, Doping doping, Silicon silicon,
                           float[][] tauSrhUs, float[][] injectionCm3, float[][] effectiveUs,
                           List<Set<ConversionWarning>> warnings) {
        this.stack = stack;
        this.settings = settings;
        this.doping = doping;
        this.silicon = silicon;
        this.tauSrhUs = tauSrhUs;
        this.injectionCm3 = injectionCm3;
        this.effectiveUs = effectiveUs;
        this.warnings = List.copyOf(warnings);
    }

    /**
     * Converts every level.
     *
     * @param defect   any defect with absolute cross-sections the conversion accepts (τ_SRH and Δn do not depend
     *                 on it)
     * @param settings physics settings
     * @param threads  threads of each conversion (results do not depend on it)
     * @throws trapmap.shared.error.InvalidValueException for missing conditions (field and unit named)
     */
    public static StackLifetimes of(InjectionStack stack, Defect defect, ConversionSettings settings, int threads) {
        Checks.notNull(stack, "stack");
        Checks.notNull(defect, "defect");
        Checks.notNull(settings, "settings");
        int n = stack.size();
        float[][] tau = new float[n][];
        float[][] dn = new float[n][];
        float[][] eff = new float[n][];
        List<Set<ConversionWarning>> warnings = new ArrayList<>();
        Set<Quantity> wanted = EnumSet.of(Quantity.SRH_LIFETIME, Quantity.INJECTION);
        for (int i = 0; i < n; i++) {
            MapConversion.Result r = MapConversion.convert(stack.level(i).map(), defect, settings, wanted, threads);
            tau[i] = r.get(Quantity.SRH_LIFETIME).raster().samples();
            dn[i] = r.get(Quantity.INJECTION).raster().samples();
            warnings.add(r.warnings());
            WaferMap m = stack.level(i).map();
            eff[i] = (m.quantity() == Quantity.PL_COUNTS ? MapConversion.lifetimeFromPl(m) : m).raster().samples();
        }
        MeasurementConditions c = stack.level(0).map().conditions();
        Conditions pc = MapConversion.physicsConditions(c, settings);
        return new StackLifetimes(stack, settings, pc.doping(), pc.silicon(), tau, dn, eff, warnings);
    }

    public InjectionStack stack() {
        return stack;
    }

    public ConversionSettings settings() {
        return settings;
    }

    /** The wafer's doping (shared by the levels). */
    public Doping doping() {
        return doping;
    }

    /** Band parameters and thermal velocities at the stack's temperature. */
    public Silicon silicon() {
        return silicon;
    }

    public int levels() {
        return tauSrhUs.length;
    }

    public int width() {
        return stack.width();
    }

    public int height() {
        return stack.height();
    }

    /** τ_SRH of pixel index {@code pixel} (row-major) at level {@code level}, µs (+∞ below the limit, NaN none). */
    public double tauSrhUs(int level, int pixel) {
        return tauSrhUs[level][pixel];
    }

    /** Δn of pixel index {@code pixel} at level {@code level}, cm^-3 (NaN without data). */
    public double injectionCm3(int level, int pixel) {
        return injectionCm3[level][pixel];
    }

    /** τ_eff of pixel index {@code pixel} at level {@code level}, µs (NaN without data). */
    public double effectiveLifetimeUs(int level, int pixel) {
        return effectiveUs[level][pixel];
    }

    /** The τ_SRH map of level {@code level}, µs (a copy). */
    public float[] tauSrhUs(int level) {
        return tauSrhUs[level].clone();
    }

    /** The Δn map of level {@code level}, cm^-3 (a copy). */
    public float[] injectionCm3(int level) {
        return injectionCm3[level].clone();
    }

    /** The warnings of the conversion of level {@code level}. */
    public Set<ConversionWarning> warnings(int level) {
        return warnings.get(level);
    }

    /** The fixed Δn of every level, cm^-3, or null when a level has a generation rate (Δn then per pixel). */
    public double[] fixedLevelsCm3() {
        if (!stack.fixedInjection()) {
            return null;
        }
        double[] d = new double[levels()];
        for (int i = 0; i < d.length; i++) {
            d[i] = stack.level(i).map().conditions().injectionPerCm3();
        }
        return d;
    }
}
