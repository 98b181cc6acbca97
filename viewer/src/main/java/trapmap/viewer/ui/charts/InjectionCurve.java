package trapmap.viewer.ui.charts;

import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.physics.conversion.PixelResult;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.shared.error.InvalidValueException;

/**
 * The injection dependence of one pixel's lifetimes for the chosen defect, all from the physics module: the pixel's
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
public record InjectionCurve(String defectId, double[] injectionPerCm3, double[] srhUs, double[] intrinsicUs,
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
    public static InjectionCurve of(TrapDensityConverter converter, double measuredUs) {
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
            srh[i] = converter.srh().lifetimeS(d, nt) * 1e6;
            intr[i] = converter.intrinsic().lifetimeS(d) * 1e6;
            eff[i] = converter.lifetimeAtInjectionUs(nt, d);
        }
        return new InjectionCurve(converter.defect().id(), dn, srh, intr, converter.surfaceLifetimeUs(), eff,
                measuredUs, r);
    }

    /**
     * The curves of pixel ({@code xPx}, {@code yPx}) of an effective-lifetime or PL map, converted with the map's
     * conditions ({@link MapConversion#physicsConditions}).
     *
     * @throws InvalidValueException for missing conditions, a pixel without data, or a map of another quantity
     */
    public static InjectionCurve at(WaferMap map, int xPx, int yPx, Defect defect, ConversionSettings settings) {
        WaferMap lifetime = switch (map.quantity()) {
            case EFFECTIVE_LIFETIME -> map;
            case PL_COUNTS -> MapConversion.lifetimeFromPl(map);
            default -> throw new InvalidValueException("quantity", "", "an injection curve needs an effective-lifetime"
                    + " or PL map, not " + map.quantity().key());
        };
        if (xPx < 0 || yPx < 0 || xPx >= map.width() || yPx >= map.height()) {
            throw new InvalidValueException("pixel", "px", "pixel (" + xPx + ", " + yPx + ") lies outside the "
                    + map.width() + "x" + map.height() + " px map");
        }
        double tau = lifetime.raster().get(xPx, yPx);
        if (Double.isNaN(tau)) {
            throw new InvalidValueException("pixel", "px", "pixel (" + xPx + ", " + yPx + ") has no data");
        }
        TrapDensityConverter c = new TrapDensityConverter(MapConversion.physicsConditions(lifetime.conditions(),
                settings), defect);
        return of(c, tau);
    }

    /** Unit of all lifetimes here. */
    public static String unit() {
        return Quantity.EFFECTIVE_LIFETIME.unit();
    }
}
