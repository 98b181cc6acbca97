package trapmap.maps.bench;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.recombination.SrhRecombination;

/**
 * Writes the injection stack of the identification benchmark ({@code scripts/bench-identify}): one round p-type
 * wafer (N_A = 1e15 cm^-3, 180 µm, SRV 2 cm/s, 300 K, 156 mm across) as {@code size}² lifetime maps at Δn = 1e13,
 * 1e14 and 1e15 cm^-3 (conditions embedded in the TIFFs), 3 % noise. Unlike the demonstration stack, every pixel
 * carries SRH recombination, so every pixel is ranked: interstitial iron everywhere (1e11 cm^-3 rising to 4e11
 * towards the edge), a chromium disc (3e11 cm^-3) and a disc with iron and chromium. τ_eff from
 * 1/τ_eff = 1/τ_intr+surf + Σ N_t / K(Δn) (Shockley &amp; Read 1952; Hall 1952) through the physics module. The same
 * arguments give the same files; a folder that already holds them (its marker file) is left as it is.
 *
 * <p>Arguments: {@code DIR [size]} (default 1024). Not a unit test.
 */
public final class StackBenchMaps {
    static final double[] LEVELS_CM3 = {1e13, 1e14, 1e15};
    static final Doping DOPING = Doping.pType(1e15);

    private StackBenchMaps() {
    }

    public static void main(String[] args) throws IOException {
        Path dir = Path.of(args[0]);
        int size = args.length > 1 ? Integer.parseInt(args[1]) : 1024;
        Path marker = dir.resolve(String.format(Locale.ROOT, ".complete-stack-%d", size));
        if (Files.exists(marker)) {
            System.err.println("stack bench maps: reusing " + size + "x" + size + " levels in " + dir);
            return;
        }
        Files.createDirectories(dir);
        double radiusMm = 78;
        PixelGrid grid = PixelGrid.centred(size, size, (2 * radiusMm + 4) / size);
        for (int l = 0; l < LEVELS_CM3.length; l++) {
            double dn = LEVELS_CM3[l];
            MeasurementConditions c = new MeasurementConditions(DOPING, 180.0, 300.0, dn, null, 2.0, null, null,
                    Map.of("data", "invented benchmark data"));
            Conditions pc = MapConversion.physicsConditions(c, ConversionSettings.DEFAULTS);
            TrapDensityConverter fe = new TrapDensityConverter(pc, DefectLibrary.byId("fe-i"));
            double cleanRate = 1e6 / fe.lifetimeAtInjectionUs(0, dn); // s^-1
            double fePerTrap = (1e6 / fe.lifetimeAtInjectionUs(1e11, dn) - cleanRate) / 1e11;
            double crPerTrap = SrhRecombination.of(DefectLibrary.byId("cr-i"), DOPING, pc.silicon())
                    .ratePerTrapCm3PerS(dn);
            Random rnd = new Random(4242 + l);
            float[] tau = new float[size * size];
            for (int y = 0; y < size; y++) {
                for (int x = 0; x < size; x++) {
                    double xm = grid.xMm(x);
                    double ym = grid.yMm(y);
                    double r = Math.hypot(xm, ym);
                    int i = y * size + x;
                    if (r > radiusMm) {
                        tau[i] = Float.NaN;
                        continue;
                    }
                    double feCm3 = 1e11 * (1 + 3 * (r / radiusMm) * (r / radiusMm));
                    double crCm3 = 0;
                    if (Math.hypot(xm - 30, ym + 20) < 15) {
                        crCm3 = 3e11;
                        feCm3 = 0;
                    } else if (Math.hypot(xm + 25, ym - 30) < 12) {
                        crCm3 = 3e11;
                        feCm3 = 5e11;
                    }
                    double rate = cleanRate + feCm3 * fePerTrap + crCm3 * crPerTrap; // s^-1
                    double noise = 1 + 0.03 * Math.max(-3, Math.min(3, rnd.nextGaussian()));
                    tau[i] = (float) (1e6 * noise / rate);
                }
            }
            String id = String.format(Locale.ROOT, "STACK-dn1e%d", 13 + l);
            WaferMap map = new WaferMap(FloatRaster.wrap(size, size, tau), grid, Quantity.EFFECTIVE_LIFETIME,
                    "BENCH-STACK", c, Provenance.of("trapmap identification benchmark (invented data)").then(
                            ProcessingStep.of("bench-generate", "injection_cm3", Double.toString(dn))));
            MapFiles.write(map, dir.resolve(id + ".tif"));
        }
        Files.writeString(marker, "complete\n", StandardCharsets.UTF_8);
    }
}
