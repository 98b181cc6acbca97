package trapmap.physics.material;

/** Silicon band gap models, E_g(T) in eV. */
public final class BandGap {
    private BandGap() {
    }

    /**
     * Paessler, PRB 66, 085201 (2002), with the silicon parameters used by Couderc, Amara &amp; Lemiti,
     * JAP 115, 093705 (2014): E0 = 1.17 eV, α = 3.23e-4 eV/K, Θ = 446 K, Δ = 0.51. Gives 1.1242 eV at 300 K.
     */
    public static double paesslerEv(double temperatureK) {
        double e0 = 1.17;
        double alpha = 3.23e-4;
        double theta = 446.0;
        double delta = 0.51;
        double gamma = (1 - 3 * delta * delta) / (Math.exp(theta / temperatureK) - 1);
        double xi = 2 * temperatureK / theta;
        double s = 1 + Math.PI * Math.PI * xi * xi / (3 * (1 + delta * delta))
                + (3 * delta * delta - 1) / 4 * xi * xi * xi + 8.0 / 3.0 * Math.pow(xi, 4) + Math.pow(xi, 6);
        return e0 - alpha * theta * (gamma + 1.5 * delta * delta * (Math.pow(s, 1.0 / 6.0) - 1));
    }

    /** Green, JAP 67, 2944 (1990), piecewise fit (below 190 K, 190–300 K, above 300 K). */
    public static double green1990Ev(double temperatureK) {
        double t = temperatureK;
        if (t < 190) {
            return 1.1700 + 1.059e-5 * t - 6.05e-7 * t * t;
        }
        if (t < 300) {
            return 1.1785 - 9.025e-5 * t - 3.05e-7 * t * t;
        }
        return 1.206 - 2.73e-4 * t;
    }
}
