package trapmap.maps.demo;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.pl.PlCalibration;

/**
 * Draws the maps of demonstration wafers from their planted density: per pixel the effective lifetime at the
 * map's injection (1/τ_eff = N_t/K(Δn) + 1/τ_intr(Δn) + 1/τ_surf, {@link TrapDensityConverter#lifetimeAtInjectionUs})
 * or the PL counts at a generation rate, times a seeded measurement noise, and the planted defects with the probe
 * pixel where their density holds.
 */
final class LifetimeDrawing {
    private LifetimeDrawing() {
    }

    /** A value at a position on the wafer, mm from its centre. */
    @FunctionalInterface
    interface Drawn {
        double at(double xMm, double yMm);
    }

    /**
     * A map's samples: {@code value} at the centre of every pixel inside {@code shape}, taken row by row (so a
     * seeded noise inside it is drawn in the same order every time), NaN outside.
     */
    static float[] overWafer(PixelGrid grid, WaferShape shape, Drawn value) {
        float[] out = new float[grid.width() * grid.height()];
        for (int y = 0; y < grid.height(); y++) {
            for (int x = 0; x < grid.width(); x++) {
                double xm = grid.xMm(x);
                double ym = grid.yMm(y);
                out[y * grid.width() + x] = shape.contains(xm, ym) ? (float) value.at(xm, ym) : Float.NaN;
            }
        }
        return out;
    }

    static DemoFile lifetimeFile(String name, String id, WaferFormat format, PixelGrid grid,
                                 MeasurementConditions c, PlantedField f, String defect, Random rnd, String what) {
        return lifetimeFile(name, id, format.shape(), grid, c, f, defect, rnd, what,
                DemoScenario.provenance(defect, id));
    }

    /**
     * As {@link #lifetimeFile(String, String, WaferFormat, PixelGrid, MeasurementConditions, PlantedField, String,
     * Random, String)} for any wafer outline, with the map's provenance given.
     */
    static DemoFile lifetimeFile(String name, String id, WaferShape shape, PixelGrid grid,
                                 MeasurementConditions c, PlantedField f, String defect, Random rnd, String what,
                                 Provenance provenance) {
        TrapDensityConverter forward = forward(c, defect);
        double dn = c.injectionPerCm3();
        float[] tau = overWafer(grid, shape, (xm, ym) -> forward.lifetimeAtInjectionUs(f.total(xm, ym), dn)
                * noise(rnd));
        WaferMap map = new WaferMap(FloatRaster.wrap(grid.width(), grid.height(), tau), grid,
                Quantity.EFFECTIVE_LIFETIME, id, c, provenance);
        return new DemoFile(name, map, what, truth(f, grid, forward, defect, Double.NaN));
    }

    /** The converter whose exact inverse generates the lifetimes: same conditions as the conversion reads. */
    static TrapDensityConverter forward(MeasurementConditions c, String defect) {
        MeasurementConditions fixed = c.injectionPerCm3() != null ? c : c.withGeneration(null).withInjection(1e14);
        Conditions pc = MapConversion.physicsConditions(fixed, ConversionSettings.DEFAULTS);
        return new TrapDensityConverter(pc.withInjection(Injection.fixed(fixed.injectionPerCm3())),
                DefectLibrary.byId(defect));
    }

    /** Δn with Δn = G·τ_eff(Δn), by bisection on a log scale (τ_eff falls or stays as Δn rises here). */
    static double steadyStateInjection(TrapDensityConverter forward, double nt, double g) {
        double lo = StrictMath.log(1e6);
        double hi = StrictMath.log(1e19);
        for (int k = 0; k < 200 && hi - lo > 1e-13; k++) {
            double mid = 0.5 * (lo + hi);
            double dn = StrictMath.exp(mid);
            double tauS = forward.lifetimeAtInjectionUs(nt, dn) * 1e-6;
            if (dn < g * tauS) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return StrictMath.exp(0.5 * (lo + hi));
    }

    static double noise(Random rnd) {
        return 1 + DemoScenario.NOISE * StrictMath.max(-3, StrictMath.min(3, rnd.nextGaussian()));
    }

    /**
     * PL counts of a wafer at generation rate {@code g}: per pixel inside the wafer the injection solving
     * Δn = G·τ_eff(Δn), turned into counts by the calibration, times the noise; NaN outside.
     */
    static float[] plCounts(PixelGrid grid, WaferShape shape, PlantedField f, TrapDensityConverter forward,
                            PlCalibration cal, double g, Random rnd) {
        return overWafer(grid, shape, (xm, ym) -> cal.counts(steadyStateInjection(forward, f.total(xm, ym), g))
                * noise(rnd));
    }

    // ---------------------------------------------------------------- truth


    static List<PlantedDefect> truth(PlantedField f, PixelGrid grid, TrapDensityConverter forward, String defect,
                                     double generation) {
        List<PlantedDefect> out = new ArrayList<>();
        for (PlantedField.Edge e : f.edges()) {
            double[] centre = e.centre();
            double[] probe = snap(grid, e.probe(2.0));
            out.add(planted(f, forward, defect, generation, "edge-zone", centre[0], centre[1], Double.NaN,
                    e.decayMm(), e.side(), probe,
                    f.total(probe[0], probe[1]) - e.density(probe[0], probe[1]) / f.divisor()));
        }
        if (f.ring() != null) {
            double[] probe = snap(grid, new double[] {f.ring().radiusMm(), 0});
            out.add(planted(f, forward, defect, generation, "ring", 0, 0, f.ring().radiusMm(), f.ring().widthMm(), null,
                    probe, f.base(probe[0], probe[1]) / f.divisor()));
        }
        for (PlantedField.Spot s : f.spots()) {
            double[] probe = snap(grid, new double[] {s.xMm(), s.yMm()});
            out.add(planted(f, forward, defect, generation, s.kind(), s.xMm(), s.yMm(), s.radiusMm(), Double.NaN, null,
                    probe, f.base(probe[0], probe[1]) / f.divisor()));
        }
        return out;
    }

    private static PlantedDefect planted(PlantedField f, TrapDensityConverter forward, String defect, double generation,
                                         String kind, double cx, double cy, double radius, double width, String side,
                                         double[] probe, double background) {
        double nt = f.total(probe[0], probe[1]);
        double tau = Double.isNaN(generation)
                ? forward.lifetimeAtInjectionUs(nt, forward.conditions().injection() instanceof Injection.Fixed fx
                        ? fx.excessPerCm3() : Double.NaN)
                : steadyStateInjection(forward, nt, generation) / generation * 1e6;
        return new PlantedDefect(kind, defect, cx, cy, radius, width, side, probe[0], probe[1], nt, background, tau);
    }

    /** The pixel centre nearest to a point, in mm. */
    private static double[] snap(PixelGrid grid, double[] p) {
        double x = StrictMath.rint(grid.xPx(p[0]));
        double y = StrictMath.rint(grid.yPx(p[1]));
        return new double[] {grid.xMm(x), grid.yMm(y)};
    }
}
