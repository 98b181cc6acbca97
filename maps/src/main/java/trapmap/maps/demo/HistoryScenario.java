package trapmap.maps.demo;

import java.io.IOException;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;
import java.util.function.DoubleBinaryOperator;
import trapmap.maps.geometry.RoundWafer;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.Doping;

/**
 * An invented production history for trend charts, generated deterministically from a fixed seed: {@value #DAYS}
 * days of furnace runs, {@value #LOTS_PER_DAY} lots a day, alternately in furnace tube {@value #STEADY_TUBE} and
 * {@value #DRIFT_TUBE}, and from each lot the monitor wafers of boat slots {@link #SLOTS} measured as small lifetime
 * maps (64 × 64 px at 2.6 mm, round 156 mm p-type Czochralski wafers, interstitial iron).
 *
 * <p>Two faults are planted. From {@link #CHANGE_AT} on, the interstitial iron of every lot run in tube
 * {@value #DRIFT_TUBE} rises linearly, by {@value #DRIFT_PER_DAY} of its level per day after that instant (the lot's
 * furnace time counts); tube {@value #STEADY_TUBE} stays as it was. And the wafer in boat slot {@value #BAD_SLOT}
 * of every lot carries a local contamination spot at the same place ({@link #SPOT_X_MM}, {@link #SPOT_Y_MM}, radius
 * {@link #SPOT_RADIUS_MM} mm, {@link #SPOT_DENSITY_CM3} cm⁻³).
 *
 * <p>Each lot has a log-normal lot-to-lot factor (σ {@value #LOT_SIGMA}), each wafer a wafer-to-wafer factor
 * (σ {@value #WAFER_SIGMA}) on the baseline iron {@value #BASELINE_FE_CM3} cm⁻³, with a mild radial rise
 * (+{@value #RADIAL_RISE} at the edge). The lifetimes are drawn from the planted iron through the same physics the
 * conversion inverts ({@link LifetimeDrawing}), with the demonstration set's 1.5 % measurement noise. Every sidecar
 * carries the facts {@code lot}, {@code measured_at} (ISO-8601 UTC), {@code furnace_tube} and {@code boat_slot};
 * {@code truth.json} records the planted faults and every wafer's planted level.
 *
 * <p>All names (lots, tubes, wafers) are invented. Nothing here is measured data.
 */
public final class HistoryScenario {
    /** The seed of the whole history. */
    public static final long SEED = 20_261_005L;
    /** Midnight UTC of the first production day. */
    public static final Instant START = Instant.parse("2026-10-05T00:00:00Z");
    /** Production days. */
    public static final int DAYS = 21;
    /** Furnace runs (lots) a day, at 06:00, 14:00 and 22:00 UTC. */
    public static final int LOTS_PER_DAY = 3;
    /** The boat slots whose monitor wafers are measured in every lot. */
    public static final List<Integer> SLOTS = List.of(2, 7, 14);
    /** The tube whose iron stays at its level. */
    public static final String STEADY_TUBE = "T1";
    /** The tube whose iron drifts upward after {@link #CHANGE_AT}. */
    public static final String DRIFT_TUBE = "T2";
    /** When the drift of {@link #DRIFT_TUBE} begins: midnight UTC of the eleventh day. */
    public static final Instant CHANGE_AT = START.plus(Duration.ofDays(10));
    /** Rise of the drifting tube's iron per day after {@link #CHANGE_AT}, as a fraction of its level. */
    public static final double DRIFT_PER_DAY = 0.15;
    /** Baseline interstitial iron at the wafer centre, cm^-3. */
    public static final double BASELINE_FE_CM3 = 3e10;
    /** Relative rise of the background iron from the centre to the wafer edge. */
    public static final double RADIAL_RISE = 0.15;
    /** Log-normal σ of the lot-to-lot factor. */
    public static final double LOT_SIGMA = 0.08;
    /** Log-normal σ of the wafer-to-wafer factor. */
    public static final double WAFER_SIGMA = 0.04;
    /** The boat slot whose wafers carry the contamination spot. */
    public static final int BAD_SLOT = 7;
    /** Centre of the spot, mm from the wafer centre (x right). */
    public static final double SPOT_X_MM = 45;
    /** Centre of the spot, mm from the wafer centre (y up). */
    public static final double SPOT_Y_MM = -30;
    /** Radius of the spot (flat top), mm. */
    public static final double SPOT_RADIUS_MM = 6;
    /** Interstitial iron inside the spot, cm^-3. */
    public static final double SPOT_DENSITY_CM3 = 2e12;
    /** Wafer diameter, mm. */
    public static final double DIAMETER_MM = 156;
    /** Pixels per side of every map. */
    public static final int PIXELS = 64;
    /** Pixel pitch, mm. */
    public static final double PITCH_MM = 2.6;
    /** The defect the lifetimes are drawn with. */
    public static final String DEFECT = "fe-i";
    /** Excess carrier density of the lifetime maps, cm^-3. */
    public static final double INJECTION_CM3 = 1e14;
    private static final String SOURCE = "trapmap demo --history generator (invented data, seed " + SEED + ")";

    /** Name of the rules file written with the history. */
    public static final String RULES = "rules-history.json";
    /**
     * The end of the baseline of the rules' {@code trend} block: the first 7 days, well before {@link #CHANGE_AT}, so
     * that each tube's limits come from its steady wafers only.
     */
    public static final Instant TREND_BASELINE_UNTIL = START.plus(Duration.ofDays(7));

    private HistoryScenario() {
    }

    /**
     * One measured wafer of the history.
     *
     * @param file         its map and planted defects (the spot of slot {@value #BAD_SLOT}, none otherwise)
     * @param lot          lot id, e.g. {@code L0042}
     * @param furnaceTube  {@value #STEADY_TUBE} or {@value #DRIFT_TUBE}
     * @param boatSlot     boat slot of the wafer
     * @param processedAt  end of the lot's furnace run
     * @param measuredAt   when the map was taken
     * @param driftFactor  factor of the tube drift on the lot's iron (1 before {@link #CHANGE_AT} and in the steady
     *                     tube)
     * @param centreFeCm3  planted interstitial iron at the wafer centre, cm^-3 (baseline × lot, wafer and drift
     *                     factors)
     */
    public record Wafer(DemoFile file, String lot, String furnaceTube, int boatSlot, Instant processedAt,
                        Instant measuredAt, double driftFactor, double centreFeCm3) {
    }

    /** The wafers of the history in time order. The same on every call. */
    public static List<Wafer> build() {
        List<Wafer> out = new ArrayList<>();
        PixelGrid grid = PixelGrid.centred(PIXELS, PIXELS, PITCH_MM);
        RoundWafer shape = RoundWafer.disk(DIAMETER_MM);
        Doping doping = Doping.fromResistivity(ConductivityType.P, 1.5);
        for (int day = 0; day < DAYS; day++) {
            for (int k = 0; k < LOTS_PER_DAY; k++) {
                int n = day * LOTS_PER_DAY + k;
                String lot = String.format(Locale.ROOT, "L%04d", n + 1);
                String tube = n % 2 == 0 ? STEADY_TUBE : DRIFT_TUBE;
                Random lotRnd = new Random(SEED * 31 + n);
                Instant processed = START.plus(Duration.ofDays(day)).plus(Duration.ofHours(6 + 8L * k))
                        .plus(Duration.ofMinutes(lotRnd.nextInt(30)));
                double lotFactor = StrictMath.exp(LOT_SIGMA * lotRnd.nextGaussian());
                double drift = driftFactor(tube, processed);
                Instant measured = processed.plus(Duration.ofMinutes(90 + lotRnd.nextInt(60)));
                for (int slot : SLOTS) {
                    Random rnd = new Random(SEED * 37 + 100L * n + slot);
                    double centre = BASELINE_FE_CM3 * lotFactor * drift
                            * StrictMath.exp(WAFER_SIGMA * rnd.nextGaussian());
                    out.add(wafer(lot, tube, slot, processed, measured, drift, centre, grid, shape, doping, rnd));
                    measured = measured.plus(Duration.ofMinutes(4));
                }
            }
        }
        return out;
    }

    /** The factor of the tube drift on the iron of a lot run in {@code tube} at {@code processed}. */
    public static double driftFactor(String tube, Instant processed) {
        if (!tube.equals(DRIFT_TUBE) || !processed.isAfter(CHANGE_AT)) {
            return 1;
        }
        double days = Duration.between(CHANGE_AT, processed).getSeconds() / 86_400.0;
        return 1 + DRIFT_PER_DAY * days;
    }

    private static Wafer wafer(String lot, String tube, int slot, Instant processed, Instant measured, double drift,
                               double centre, PixelGrid grid, RoundWafer shape, Doping doping, Random rnd) {
        String id = String.format(Locale.ROOT, "%s-S%02d", lot, slot);
        double r2 = DIAMETER_MM * DIAMETER_MM / 4;
        DoubleBinaryOperator bg = (x, y) -> centre * (1 + RADIAL_RISE * (x * x + y * y) / r2);
        List<PlantedField.Spot> spots = slot == BAD_SLOT
                ? List.of(new PlantedField.Spot("spot", SPOT_X_MM, SPOT_Y_MM, SPOT_RADIUS_MM, SPOT_DENSITY_CM3))
                : List.of();
        PlantedField f = new PlantedField(bg, List.of(), spots, null, 1);
        Map<String, String> facts = new TreeMap<>();
        facts.put("lot", lot);
        facts.put("measured_at", measured.toString());
        facts.put("furnace_tube", tube);
        facts.put("boat_slot", Integer.toString(slot));
        facts.put("material", "Czochralski monocrystalline, p-type, furnace monitor");
        facts.put("resistivity", "p:1.5ohmcm");
        MeasurementConditions c = DemoScenario.conditions(doping, 180, 5, INJECTION_CM3, null, facts);
        String what = String.format(Locale.ROOT, "lot %s, tube %s, slot %d%s", lot, tube, slot,
                slot == BAD_SLOT ? ", contamination spot" : "");
        Provenance provenance = Provenance.of(SOURCE).then(ProcessingStep.of("demo-generate", "wafer", id,
                "defect", DEFECT, "noise", Double.toString(DemoScenario.NOISE)));
        DemoFile file = LifetimeDrawing.lifetimeFile(id + ".tif", id, shape, grid, c, f, DEFECT, rnd, what,
                provenance);
        return new Wafer(file, lot, tube, slot, processed, measured, drift, centre);
    }

    /**
     * Writes the history into {@code dir} (created when missing): per wafer a TIFF with embedded metadata and a JSON
     * sidecar, then {@code truth.json}, {@value #RULES} and {@code README.md}. Every file is written atomically;
     * files of the same names are replaced. Two runs give byte-identical files.
     *
     * @return the files written, in order
     */
    public static List<Path> write(Path dir) throws IOException {
        return HistorySetFiles.write(dir, build());
    }

    /** Reads the planted faults and wafers back from a history's {@code truth.json}. */
    public static HistoryTruth readTruth(Path file) throws IOException {
        return HistorySetFiles.readTruth(file);
    }
}
