package trapmap.maps.demo;

import java.util.List;
import java.util.Random;
import java.util.function.DoubleBinaryOperator;

/**
 * A planted trap-density map of a demonstration wafer, cm^-3 at (x, y) in mm from the wafer centre: background +
 * edge zones + ring, divided by {@code divisor} (gettering) except inside spots, which blend to their own level.
 * The parts (grains, edge zones, marks and spots, rings) are the nested types.
 */
record PlantedField(DoubleBinaryOperator background, List<Edge> edges, List<Spot> spots, Ring ring, double divisor) {
    /** Background, edge zones and ring at (x, y) mm, cm^-3, before gettering and spots. */
    double base(double x, double y) {
        double n = background.applyAsDouble(x, y);
        for (Edge e : edges) {
            n += e.density(x, y);
        }
        if (ring != null) {
            n += ring.density(x, y);
        }
        return n;
    }

    /** The planted density at (x, y) mm, cm^-3. */
    double total(double x, double y) {
        double n = base(x, y) / divisor;
        for (Spot s : spots) {
            double w = s.weight(x, y);
            n = n * (1 - w) + s.level * w;
        }
        return n;
    }

    /** Grain structure: Voronoi cells with log-uniform background density, grain boundaries ×2.5. */
    static final class Grains implements DoubleBinaryOperator {
        private final double[] sx;
        private final double[] sy;
        private final double[] level;

        Grains(Random rnd, double half, int n, double min, double max) {
            sx = new double[n];
            sy = new double[n];
            level = new double[n];
            for (int i = 0; i < n; i++) {
                sx[i] = (rnd.nextDouble() * 2 - 1) * half;
                sy[i] = (rnd.nextDouble() * 2 - 1) * half;
                level[i] = min * StrictMath.pow(max / min, rnd.nextDouble());
            }
        }

        @Override
        public double applyAsDouble(double x, double y) {
            double d1 = Double.POSITIVE_INFINITY;
            double d2 = Double.POSITIVE_INFINITY;
            int best = 0;
            for (int i = 0; i < sx.length; i++) {
                double d = StrictMath.hypot(x - sx[i], y - sy[i]);
                if (d < d1) {
                    d2 = d1;
                    d1 = d;
                    best = i;
                } else if (d < d2) {
                    d2 = d;
                }
            }
            // (d2 − d1)/2 is close to the distance to the boundary between the two nearest grains.
            return level[best] * ((d2 - d1) / 2 < 0.4 ? 2.5 : 1);
        }
    }

    /** Iron diffused in from one side of the wafer: density·exp(−d/λ), d the distance from that side. */
    record Edge(String side, double half, double densityAtEdge, double decayMm) {
        double distance(double x, double y) {
            return switch (side) {
                case "left" -> x + half;
                case "right" -> half - x;
                case "bottom" -> y + half;
                default -> half - y;
            };
        }

        double density(double x, double y) {
            return densityAtEdge * StrictMath.exp(-StrictMath.max(0, distance(x, y)) / decayMm);
        }

        double[] centre() {
            return switch (side) {
                case "left" -> new double[] {-half, 0};
                case "right" -> new double[] {half, 0};
                case "bottom" -> new double[] {0, -half};
                default -> new double[] {0, half};
            };
        }

        double[] probe(double inset) {
            double[] c = centre();
            return new double[] {c[0] - StrictMath.signum(c[0]) * inset, c[1] - StrictMath.signum(c[1]) * inset};
        }
    }

    /** A flat-topped disc of density {@code level} with an edge one pixel wide. */
    record Spot(String kind, double xMm, double yMm, double radiusMm, double level) {
        double weight(double x, double y) {
            double r = StrictMath.hypot(x - xMm, y - yMm);
            double h = 0.3;
            return StrictMath.max(0, StrictMath.min(1, (radiusMm + h - r) / (2 * h)));
        }
    }

    /** A concentric ring: Gaussian in radius around {@code radiusMm}, added to the background. */
    record Ring(double radiusMm, double widthMm, double peak) {
        double density(double x, double y) {
            double u = (StrictMath.hypot(x, y) - radiusMm) / widthMm;
            return peak * StrictMath.exp(-0.5 * u * u);
        }
    }
}
