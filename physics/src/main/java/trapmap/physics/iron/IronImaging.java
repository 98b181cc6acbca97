package trapmap.physics.iron;

import java.util.EnumSet;
import java.util.Set;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.units.Units;

/**
 * Interstitial iron from lifetimes before and after dissociating the iron–boron pairs (Macdonald, Geerligs &amp;
 * Azzizi, JAP 95, 1021 (2004)):
 * <pre>
 * [Fe_i] = C(Δn, N_A, T)·(1/τ_after − 1/τ_before),   C = 1/(χ_Fei − χ_FeB)
 * </pre>
 * with χ the SRH recombination rate per unit trap density of each state at the pixel's Δn. Assumes complete
 * dissociation, all other recombination unchanged, and the same Δn in both measurements. C diverges at the
 * crossover injection where both states give the same lifetime and changes sign above it; results within a factor
 * 2 of the crossover carry {@link ConversionWarning#NEAR_IRON_CROSSOVER}, and within ±10 % of it the method has no
 * usable signal and the result is {@link PixelStatus#INVALID}. A lifetime change in the direction the sign of C
 * forbids (a fall above the crossover, a rise below it) larger than the resolution is
 * {@link PixelStatus#INCONSISTENT}, with the reason.
 */
public final class IronImaging {
    /** Within this factor of the crossover the method has no signal: the result is INVALID. */
    public static final double NO_SIGNAL_FACTOR = 1.1;
    /** Within this factor of the crossover results carry a warning. */
    public static final double WARNING_FACTOR = 2.0;

    private final SrhRecombination interstitial;
    private final SrhRecombination pair;
    private final double crossoverPerCm3;
    private final double resolution;
    /** Warnings that hold for every pixel (velocity convention). */
    private final Set<ConversionWarning> baseWarnings;

    /** Iron imaging with the library's fe-i and fe-b parameter sets. */
    public IronImaging(Doping doping, Silicon silicon) {
        this(doping, silicon, DefectLibrary.byId("fe-i"), DefectLibrary.byId("fe-b"), Conditions.DEFAULT_RESOLUTION);
    }

    /**
     * @param interstitialIron parameters of Fe_i (the state after dissociation)
     * @param ironBoron        parameters of the FeB pair (the state before)
     * @param resolution       relative lifetime resolution for the detection limit (e.g. 0.05)
     */
    public IronImaging(Doping doping, Silicon silicon, Defect interstitialIron, Defect ironBoron, double resolution) {
        if (doping.type() != ConductivityType.P) {
            throw new InvalidValueException("doping", "", "iron imaging by FeB dissociation needs p-type (boron)"
                    + " material, but the doping is n-type");
        }
        this.interstitial = SrhRecombination.of(interstitialIron, doping, silicon);
        this.pair = SrhRecombination.of(ironBoron, doping, silicon);
        this.resolution = Checks.inRange(resolution, 1e-6, 1, "detectionResolution", "");
        this.crossoverPerCm3 = findCrossover();
        this.baseWarnings = silicon.velocityModel() == interstitialIron.velocityConvention()
                && silicon.velocityModel() == ironBoron.velocityConvention()
                ? EnumSet.noneOf(ConversionWarning.class) : EnumSet.of(ConversionWarning.VELOCITY_CONVENTION);
    }

    /** C(Δn), s·cm^-3; [Fe_i] = C·(1/τ_after − 1/τ_before) with lifetimes in s. */
    public double prefactorSCm3(double dn) {
        return 1.0 / (interstitial.ratePerTrapCm3PerS(dn) - pair.ratePerTrapCm3PerS(dn));
    }

    /** The crossover injection, cm^-3, or NaN when the two states give equal lifetimes nowhere in 1e8–1e19. */
    public double crossoverPerCm3() {
        return crossoverPerCm3;
    }

    /** [Fe_i] from lifetimes (µs) before and after dissociation, measured at excess density {@code dn}. */
    public IronResult evaluate(double beforeUs, double afterUs, double dn) {
        Checks.positive(dn, "injection", "cm^-3");
        Set<ConversionWarning> warnings = EnumSet.noneOf(ConversionWarning.class);
        warnings.addAll(baseWarnings);
        double c = prefactorSCm3(dn);
        double cUs = c * Units.US_PER_S;
        double distance = Double.isNaN(crossoverPerCm3) ? Double.POSITIVE_INFINITY
                : Math.abs(Math.log(dn / crossoverPerCm3));
        if (distance < Math.log(WARNING_FACTOR)) {
            warnings.add(ConversionWarning.NEAR_IRON_CROSSOVER);
        }
        if (!(beforeUs > 0) || !(afterUs > 0) || Double.isInfinite(beforeUs) || Double.isInfinite(afterUs)
                || !Double.isFinite(c) || distance < Math.log(NO_SIGNAL_FACTOR)) {
            return new IronResult(PixelStatus.INVALID, Double.NaN, cUs, crossoverPerCm3, warnings,
                    distance < Math.log(NO_SIGNAL_FACTOR) ? "Δn is within ±10 % of the Fe_i/FeB crossover: no signal"
                    : "a lifetime is not a finite positive number");
        }
        double fe = cUs * (1.0 / afterUs - 1.0 / beforeUs);
        // The detection limit: the density that would change the lifetime by the resolution. As for single maps it
        // applies on both sides: a change smaller than that is no detectable iron, reported as the limit (an upper
        // bound), so [Fe_i] is continuous and never falls as the change in the expected direction grows.
        double limit = Math.abs(cUs) * resolution / Math.min(beforeUs, afterUs);
        if (fe >= limit) {
            return new IronResult(PixelStatus.OK, fe, cUs, crossoverPerCm3, warnings, "");
        }
        if (-fe > limit) {
            // Below the crossover dissociation (FeB -> Fe_i) must lower the lifetime, above it raise it (C < 0
            // there); a change the other way by more than the resolution is not an iron signal.
            boolean above = cUs < 0;
            String reason = "the lifetime " + (afterUs > beforeUs ? "rose" : "fell") + " from "
                    + num(beforeUs) + " to " + num(afterUs) + " µs on dissociation, but at Δn = "
                    + num(dn) + " cm^-3, " + (above ? "above" : "below") + " the Fe_i/FeB crossover ("
                    + num(crossoverPerCm3) + " cm^-3), dissociating FeB pairs can only "
                    + (above ? "raise" : "lower") + " it: the pair is inconsistent (swapped states, or other"
                    + " recombination changed between the measurements)";
            return new IronResult(PixelStatus.INCONSISTENT, Double.NaN, cUs, crossoverPerCm3, warnings, reason);
        }
        return new IronResult(PixelStatus.BELOW_LIMIT, limit, cUs, crossoverPerCm3, warnings, "");
    }

    /** Three significant digits without trailing zeros, e.g. 20, 8, 3.84e13. */
    static String num(double v) {
        if (!Double.isFinite(v)) {
            return Double.toString(v);
        }
        java.math.BigDecimal b = new java.math.BigDecimal(v).round(new java.math.MathContext(3)).stripTrailingZeros();
        double a = Math.abs(v);
        return a >= 1e-3 && a < 1e5 ? b.toPlainString() : b.toString().replace("E+", "e").replace("E", "e");
    }

    private double findCrossover() {
        double lo = Math.log(1e8);
        double hi = Math.log(1e19);
        int steps = 220;
        double prevX = lo;
        double prevF = difference(lo);
        for (int i = 1; i <= steps; i++) {
            double x = lo + (hi - lo) * i / steps;
            double f = difference(x);
            if (Math.signum(f) != Math.signum(prevF)) {
                double root = new BrentSolver(1e-13, 1e-12).solve(200, this::difference, prevX, x);
                return Math.exp(root);
            }
            prevX = x;
            prevF = f;
        }
        return Double.NaN;
    }

    /** χ_Fei − χ_FeB at Δn = e^x, relative to χ_FeB so that the solver works on numbers of order one. */
    private double difference(double logDn) {
        double dn = Math.exp(logDn);
        return interstitial.ratePerTrapCm3PerS(dn) / pair.ratePerTrapCm3PerS(dn) - 1;
    }
}
