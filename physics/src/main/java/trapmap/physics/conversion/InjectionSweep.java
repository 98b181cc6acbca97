package trapmap.physics.conversion;

import trapmap.shared.error.InvalidValueException;
import trapmap.shared.units.Units;

/**
 * The injection dependence of one pixel's lifetimes for the chosen defect (pure numerics; the viewer's injection
 * chart only draws it): the pixel's
 * measured lifetime is converted ({@link TrapDensityConverter#convert(double)}) into its trap density N_t, and over
 * Δn = {@value #MIN_INJECTION_PER_CM3} … {@value #MAX_INJECTION_PER_CM3} cm⁻³ (log-spaced) the curves are
 * <ul>
 *   <li>τ_SRH(Δn) = K(Δn)/N_t of the defect ({@link trapmap.physics.recombination.SrhRecombination#lifetimeS}),</li>
 *   <li>τ_intr(Δn), radiative + Auger ({@link trapmap.physics.recombination.IntrinsicLifetime#lifetimeS}),</li>
 *   <li>τ_surf, the surface limit (constant; infinite for ideal surfaces),</li>
 *   <li>τ_eff(Δn) = 1/(1/τ_SRH + 1/τ_intr + 1/τ_surf) ({@link TrapDensityConverter#lifetimeAtInjectionUs}),</li>
 * </ul>
 * all in µs, and the operating point (Δn used, τ measured). For a {@link PixelStatus#BELOW_LIMIT} pixel N_t is the
 * detection limit, so the τ_eff curve passes below the operating point.
 *
 * @param defectId          the defect
 * @param injectionPerCm3   the Δn grid, cm⁻³
 * @param srhUs             τ_SRH at each Δn, µs
 * @param intrinsicUs       τ_intr at each Δn, µs
 * @param surfaceUs         τ_surf, µs (infinite for ideal surfaces)
 * @param effectiveUs       τ_eff at each Δn, µs
 * @param measuredUs        the pixel's measured effective lifetime, µs
 * @param pixel             the conversion of the pixel (Δn used, N_t, status)
 */
public record InjectionSweep(String defectId, double[] injectionPerCm3, double[] srhUs, double[] intrinsicUs,
                             double surfaceUs, double[] effectiveUs, double measuredUs, PixelResult pixel) {
    /** Lowest Δn of the curve, cm⁻³. */
    public static final double MIN_INJECTION_PER_CM3 = 1e12;
    /** Highest Δn of the curve, cm⁻³. */
    public static final double MAX_INJECTION_PER_CM3 = 1e17;
    /** Points of the curves. */
    public static final int POINTS = 101;

    /**
     * The curves of a pixel whose effective lifetime is {@code measuredUs} µs, under the converter's conditions.
     *
     * @throws InvalidValueException when the lifetime is not a positive finite number
     */
    public static InjectionSweep of(TrapDensityConverter converter, double measuredUs) {
        PixelResult r = converter.convert(measuredUs);
        if (r.status() == PixelStatus.INVALID || r.status() == PixelStatus.NO_DATA) {
            throw new InvalidValueException("lifetime", "us", "the pixel's lifetime must be > 0 us and finite but was "
                    + measuredUs);
        }
        double nt = r.trapDensityPerCm3();
        double[] dn = new double[POINTS];
        double[] srh = new double[POINTS];
        double[] intr = new double[POINTS];
        double[] eff = new double[POINTS];
        double lo = Math.log10(MIN_INJECTION_PER_CM3);
        double hi = Math.log10(MAX_INJECTION_PER_CM3);
        for (int i = 0; i < POINTS; i++) {
            double d = Math.pow(10, lo + (hi - lo) * i / (POINTS - 1));
            dn[i] = d;
            srh[i] = converter.srh().lifetimeS(d, nt) * Units.US_PER_S;
            intr[i] = converter.intrinsic().lifetimeS(d) * Units.US_PER_S;
            eff[i] = converter.lifetimeAtInjectionUs(nt, d);
        }
        return new InjectionSweep(converter.defect().id(), dn, srh, intr, converter.surfaceLifetimeUs(), eff,
                measuredUs, r);
    }

    /** Unit of all lifetimes here. */
    public static String unit() {
        return "µs";
    }
}
