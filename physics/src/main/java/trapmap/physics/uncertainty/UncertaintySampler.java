package trapmap.physics.uncertainty;

import org.apache.commons.math3.random.RandomGenerator;
import org.apache.commons.math3.random.Well19937c;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.conversion.Surface;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.ParameterSpread;
import trapmap.physics.defect.Range;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * Draws one wafer's uncertain inputs, sample after sample, from a seed (the same seed gives the same samples).
 * <ul>
 * <li>Level energy E_t: uniform over the defect's published range ({@link ParameterSpread#energyEv()}, in the level's
 * own reference). The publications give an interval of values without a preferred one inside it; the uniform
 * distribution is the maximum-entropy choice for a bounded interval (Jaynes, Phys. Rev. 106, 620 (1957)).</li>
 * <li>Capture cross-sections σ_n, σ_p: independently log-uniform over their published ranges. The published values
 * of one cross-section scatter over factors, not over a fixed number of cm², so the prior is uniform in ln σ
 * (Jeffreys' scale-invariant prior for a positive scale parameter; Jeffreys, Theory of Probability, 1961).</li>
 * <li>A defect without a spread keeps its nominal parameters.</li>
 * <li>Conditions and lifetime noise: as stated in {@link ConditionUncertainty}. A draw outside a model's accepted
 * range is clamped to it (the limits of {@link Doping}, {@link Surface}, {@link Injection.Fixed},
 * {@link Injection.Generation} and {@link Silicon}: doping 1e10–1e19 cm⁻³, thickness 1–5000 µm, SRV ≤ 1e7 cm/s,
 * Δn 1e6–1e19 cm⁻³, G 1e10–1e24 cm⁻³ s⁻¹, temperature 77–500 K); this is only reached when the nominal value lies within a few uncertainties of a limit.</li>
 * </ul>
 * Every sample draws the same nine numbers in the same order (E_t, σ_n, σ_p, temperature, doping, thickness, SRV,
 * Δn or G, lifetime noise), whether or not a quantity is uncertain, so changing one uncertainty does not reshuffle the
 * others. With a temperature uncertainty the band parameters are recomputed at the drawn temperature with the models
 * of the given {@link PhysicsSettings}; without one the nominal {@link Silicon} is kept as it is (with one, the nominal silicon must be the settings' own at
the nominal temperature, so that a draw at that temperature changes nothing). Not thread-safe
 * (one sampler per thread).
 */
public final class UncertaintySampler {
    /** Pseudo-random generator: WELL19937c (Panneton, L'Ecuyer &amp; Matsumoto, ACM TOMS 32, 1 (2006)). */
    private final RandomGenerator random;
    private final Conditions nominal;
    private final Defect defect;
    private final PhysicsSettings settings;
    private final ConditionUncertainty uncertainty;

    /** One draw: the wafer's conditions and defect, and the lifetime noise factor τ_measured/τ_true. */
    public record Sample(Conditions conditions, Defect defect, double lifetimeFactor) {
    }

    /**
     * @throws InvalidValueException when the defect has no absolute cross-sections
     */
    public UncertaintySampler(Conditions nominal, Defect defect, PhysicsSettings settings,
                              ConditionUncertainty uncertainty, long seed) {
        this.nominal = Checks.notNull(nominal, "conditions");
        this.defect = Checks.notNull(defect, "defect");
        this.settings = Checks.notNull(settings, "settings");
        this.uncertainty = Checks.notNull(uncertainty, "uncertainty");
        defect.requireAbsoluteCrossSections();
        if (uncertainty.temperatureK() > 0
                && !settings.silicon(nominal.silicon().temperatureK()).equals(nominal.silicon())) {
            throw new InvalidValueException("temperature_uncertainty", "K", "a temperature uncertainty (K) needs"
                    + " the band parameters of the physics settings' models, but the conditions' silicon differs"
                    + " from them at the nominal temperature; set the temperature uncertainty to 0 or use the"
                    + " settings' silicon");
        }
        this.random = new Well19937c(seed);
    }

    /** The next sample. */
    public Sample next() {
        ParameterSpread spread = defect.spread();
        double u1 = random.nextDouble();
        double u2 = random.nextDouble();
        double u3 = random.nextDouble();
        double zT = random.nextGaussian();
        double zDoping = random.nextGaussian();
        double zThickness = random.nextGaussian();
        double zSrv = random.nextGaussian();
        double zInjection = random.nextGaussian();
        double zLifetime = random.nextGaussian();

        Defect d = defect;
        if (spread != null) {
            d = defect.withParameters(uniform(spread.energyEv(), u1),
                    logUniform(spread.electronCrossSectionCm2(), u2), logUniform(spread.holeCrossSectionCm2(), u3));
        }

        Silicon silicon = nominal.silicon();
        if (uncertainty.temperatureK() > 0) {
            double t = clamp(silicon.temperatureK() + uncertainty.temperatureK() * zT, Silicon.MIN_TEMPERATURE_K,
                    Silicon.MAX_TEMPERATURE_K);
            silicon = settings.silicon(t);
        }
        Doping doping = nominal.doping();
        if (uncertainty.dopingRelative() > 0) {
            doping = new Doping(doping.type(), clamp(logNormal(doping.densityPerCm3(), uncertainty.dopingRelative(),
                    zDoping), Doping.MIN_DENSITY_PER_CM3, Doping.MAX_DENSITY_PER_CM3));
        }
        Surface surface = nominal.surface();
        if (!surface.ideal()) {
            surface = new Surface(
                    clamp(logNormal(surface.thicknessUm(), uncertainty.thicknessRelative(), zThickness),
                            Surface.MIN_THICKNESS_UM, Surface.MAX_THICKNESS_UM),
                    clamp(logNormal(surface.srvCmPerS(), uncertainty.srvRelative(), zSrv), 0,
                            Surface.MAX_SRV_CM_PER_S),
                    surface.model());
        }
        Injection injection;
        if (nominal.injection() instanceof Injection.Fixed f) {
            injection = new Injection.Fixed(clamp(logNormal(f.excessPerCm3(), uncertainty.injectionRelative(),
                    zInjection), Injection.Fixed.MIN_EXCESS_PER_CM3, Injection.Fixed.MAX_EXCESS_PER_CM3));
        } else {
            // a fixed generation rate: the injection uncertainty is that of G (the same photon-flux calibration)
            injection = new Injection.Generation(clamp(logNormal(((Injection.Generation) nominal.injection())
                    .ratePerCm3PerS(), uncertainty.injectionRelative(), zInjection),
                    Injection.Generation.MIN_RATE_PER_CM3_PER_S, Injection.Generation.MAX_RATE_PER_CM3_PER_S));
        }
        Conditions c = new Conditions(doping, silicon, injection, surface, nominal.radiativeCm3PerS(),
                nominal.detectionResolution(), nominal.referenceInjectionPerCm3());
        double factor = Math.exp(uncertainty.lifetimeRelative() * zLifetime);
        return new Sample(c, d, factor);
    }

    private static double uniform(Range r, double u) {
        return r.min() == r.max() ? r.min() : r.clamp(r.min() + (r.max() - r.min()) * u);
    }

    private static double logUniform(Range r, double u) {
        if (r.min() == r.max()) {
            return r.min();
        }
        double lo = Math.log(r.min());
        return r.clamp(Math.exp(lo + (Math.log(r.max()) - lo) * u));
    }

    private static double logNormal(double median, double sigmaLn, double z) {
        return sigmaLn == 0 ? median : median * Math.exp(sigmaLn * z);
    }

    private static double clamp(double v, double lo, double hi) {
        return Math.max(lo, Math.min(hi, v));
    }
}
