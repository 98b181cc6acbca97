package trapmap.physics.material;

/**
 * Equilibrium carrier densities.
 *
 * @param electronsPerCm3 n0, cm^-3
 * @param holesPerCm3     p0, cm^-3
 */
public record Carriers(double electronsPerCm3, double holesPerCm3) {
}
