/**
 * Defect identification from τ_SRH measured at several injection levels (injection-dependent lifetime
 * spectroscopy, IDLS: Rein, Lifetime Spectroscopy, Springer (2005)). Pure numerics, per pixel or per region:
 * <ul>
 * <li>{@link trapmap.physics.spectroscopy.LibraryRanking}: for each library defect the one free parameter N_t by
 * weighted least squares, its standard error, χ² and p-value, and a ranking with a defect hint;</li>
 * <li>{@link trapmap.physics.spectroscopy.DpssFit}: the defect parameter solution surface (Rein et al., JAP 91, 2059
 * (2002)) in the linearised form of Murphy et al., JAP 111, 113709 (2012): for each trial E_t the non-negative
 * (τ_n0, τ_p0), k(E_t) and the residual, the minimum-residual band and the library defects on the curve.</li>
 * </ul>
 * The curves given here are τ_SRH alone: intrinsic and surface recombination must already be removed (e.g. with
 * {@code TrapDensityConverter}). Times are seconds, densities cm^-3, energies eV.
 */
package trapmap.physics.spectroscopy;
