package trapmap.physics.recombination;

import trapmap.physics.defect.Defect;
import trapmap.physics.defect.ParameterSpread;
import trapmap.physics.defect.Range;
import trapmap.physics.material.Carriers;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;

/**
 * The exact extremes of the equivalent trap density over a defect's published parameter spread.
 * <p>
 * N_t = K/τ_SRH with K = [(n0 + n1 + Δn)/c_p + (p0 + p1 + Δn)/c_n]/(n0 + p0 + Δn). K falls as either capture
 * coefficient rises, for every level energy, so the minimum takes both σ at their maxima and the maximum both at
 * their minima. In the level energy only n1/c_p + p1/c_n varies; with n1 p1 = n_i² it is convex in ln n1 with its
 * minimum at n1* = n_i sqrt(c_p/c_n), independent of Δn. So the minimum uses n1* clamped to the energy range and
 * the maximum the end of the range with the larger n1/c_p + p1/c_n. No sampling is involved.
 */
public final class SrhBounds {
    private final SrhRecombination lower;
    private final SrhRecombination upper;

    private SrhBounds(SrhRecombination lower, SrhRecombination upper) {
        this.lower = lower;
        this.upper = upper;
    }

    /** Bounds for {@code defect}; a defect without a spread gets its nominal parameters for both. */
    public static SrhBounds of(Defect defect, Doping doping, Silicon silicon) {
        defect.requireAbsoluteCrossSections();
        ParameterSpread s = defect.spread();
        if (s == null) {
            SrhRecombination nominal = SrhRecombination.of(defect, doping, silicon);
            return new SrhBounds(nominal, nominal);
        }
        Carriers eq = doping.equilibrium(silicon.intrinsicPerCm3());
        double ni2 = silicon.intrinsicPerCm3() * silicon.intrinsicPerCm3();
        Range e = s.energyEv();
        double n1a = defect.level().withEnergy(e.min()).n1PerCm3(silicon);
        double n1b = defect.level().withEnergy(e.max()).n1PerCm3(silicon);
        double n1Lo = Math.min(n1a, n1b);
        double n1Hi = Math.max(n1a, n1b);

        double cnMax = s.electronCrossSectionCm2().max() * silicon.electronVthCmPerS();
        double cpMax = s.holeCrossSectionCm2().max() * silicon.holeVthCmPerS();
        double n1Best = Math.max(n1Lo, Math.min(n1Hi, Math.sqrt(ni2 * cpMax / cnMax)));
        SrhRecombination lower = new SrhRecombination(eq, n1Best, ni2 / n1Best, cnMax, cpMax);

        double cnMin = s.electronCrossSectionCm2().min() * silicon.electronVthCmPerS();
        double cpMin = s.holeCrossSectionCm2().min() * silicon.holeVthCmPerS();
        double gLo = n1Lo / cpMin + ni2 / n1Lo / cnMin;
        double gHi = n1Hi / cpMin + ni2 / n1Hi / cnMin;
        double n1Worst = gLo >= gHi ? n1Lo : n1Hi;
        SrhRecombination upper = new SrhRecombination(eq, n1Worst, ni2 / n1Worst, cnMin, cpMin);
        return new SrhBounds(lower, upper);
    }

    /** The parameter set giving the smallest density. */
    public SrhRecombination lower() {
        return lower;
    }

    /** The parameter set giving the largest density. */
    public SrhRecombination upper() {
        return upper;
    }
}
