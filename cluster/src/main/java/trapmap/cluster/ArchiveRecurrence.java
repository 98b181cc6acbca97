package trapmap.cluster;

import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.spark.api.java.JavaPairRDD;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.SaveMode;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructField;
import org.apache.spark.sql.types.StructType;
import scala.Tuple2;
import trapmap.maps.batch.HotSpots;
import trapmap.maps.batch.Recurrence;
import trapmap.maps.batch.RecurrenceMap;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.region.Region;

/**
 * The recurrence maps of an archive, aggregated in Spark: each partition adds its wafers' footprints to a
 * {@link RecurrenceMap} (the batch's own counting), the per-family counts are summed by family across partitions
 * ({@code reduceByKey}), and the driver makes each family's fraction map ({@link RecurrenceMap#families}) and finds
 * its hot spots ({@link HotSpots}, default criteria) from the sums, as {@code inspect} does for its batch. Written as
 * two small Parquet tables: {@code recurrence} (one row per cell a wafer was evaluated in: family, cell centre in mm,
 * wafers evaluated and flagged there, the flagged share) and {@code hotspots} (one row per hot spot).
 */
public final class ArchiveRecurrence {
    public static final String RECURRENCE = "recurrence";
    public static final String HOTSPOTS = "hotspots";

    static final StructType CELLS = new StructType(new StructField[] {
        DataTypes.createStructField("family", DataTypes.StringType, false),
        DataTypes.createStructField("x_mm", DataTypes.DoubleType, false),
        DataTypes.createStructField("y_mm", DataTypes.DoubleType, false),
        DataTypes.createStructField("wafers", DataTypes.IntegerType, false),
        DataTypes.createStructField("flagged_share", DataTypes.DoubleType, false),
        DataTypes.createStructField("family_wafers", DataTypes.IntegerType, false)});

    static final StructType SPOTS = new StructType(new StructField[] {
        DataTypes.createStructField("family", DataTypes.StringType, false),
        DataTypes.createStructField("family_wafers", DataTypes.IntegerType, false),
        DataTypes.createStructField("spot", DataTypes.IntegerType, false),
        DataTypes.createStructField("cells", DataTypes.IntegerType, false),
        DataTypes.createStructField("area_mm2", DataTypes.DoubleType, false),
        DataTypes.createStructField("peak_share", DataTypes.DoubleType, false),
        DataTypes.createStructField("centroid_x_mm", DataTypes.DoubleType, false),
        DataTypes.createStructField("centroid_y_mm", DataTypes.DoubleType, false)});

    /** Cells of the recurrence table per task when it is written. */
    private static final int CELLS_PER_TASK = 10_000;

    /** The recurrence of each family and its hot spots (default criteria), by family name. */
    public record Outcome(Map<String, Recurrence> families, Map<String, HotSpots.Result> hotSpots) {
    }

    private ArchiveRecurrence() {
    }

    /**
     * Sums the footprints of {@code footprints} (the job's footprints table: the columns of
     * {@link WaferRows#FOOTPRINT} among others) per family.
     */
    public static Outcome aggregate(Dataset<Row> footprints) {
        String[] columns = WaferRows.FOOTPRINT.fieldNames();
        JavaPairRDD<String, RecurrenceMap.Counts> perFamily = footprints
                .select(columns[0], java.util.Arrays.copyOfRange(columns, 1, columns.length)).javaRDD()
                .mapPartitions((Iterator<Row> rows) -> {
                    RecurrenceMap part = new RecurrenceMap();
                    rows.forEachRemaining(r -> part.add(WaferRows.footprint(r)));
                    return part.counts().iterator();
                })
                .mapToPair(c -> new Tuple2<>(c.family(), c))
                .reduceByKey(ArchiveRecurrence::sum);
        RecurrenceMap all = new RecurrenceMap();
        perFamily.values().collect().forEach(all::addCounts);
        Map<String, Recurrence> families = all.families();
        Map<String, HotSpots.Result> spots = new LinkedHashMap<>();
        families.forEach((name, r) -> spots.put(name, HotSpots.find(r, HotSpots.Criteria.DEFAULT)));
        return new Outcome(families, spots);
    }

    /** The counts of one family's two parts added up, as {@link RecurrenceMap#addAll} adds them. */
    static RecurrenceMap.Counts sum(RecurrenceMap.Counts a, RecurrenceMap.Counts b) {
        RecurrenceMap m = new RecurrenceMap();
        m.addCounts(a);
        m.addCounts(b);
        return m.counts().get(0);
    }

    /** Writes the two tables under {@code out} (a folder path or URI ending in {@code /}), replacing earlier ones. */
    static void write(SparkSession spark, Outcome o, String out) {
        List<Row> cells = new ArrayList<>();
        List<Row> spots = new ArrayList<>();
        o.families().forEach((name, r) -> {
            WaferMap f = r.fraction();
            PixelGrid g = f.grid();
            float[] s = f.raster().samples();
            for (int y = 0; y < f.height(); y++) {
                for (int x = 0; x < f.width(); x++) {
                    int i = y * f.width() + x;
                    if (r.wafersAt(i) > 0) {
                        cells.add(RowFactory.create(name, g.xMm(x), g.yMm(y), r.wafersAt(i), (double) s[i],
                                r.wafers()));
                    }
                }
            }
            HotSpots.Result h = o.hotSpots().get(name);
            for (Region spot : h.regions().regions()) {
                spots.add(RowFactory.create(name, r.wafers(), spot.id(), spot.pixelCount(), spot.areaMm2(),
                        spot.peakValue(), spot.centroidXMm(), spot.centroidYMm()));
            }
        });
        // the cells in slices of at most CELLS_PER_TASK (a 300 mm family has about 70,000), so that no task carries
        // them all (a file per slice)
        org.apache.spark.api.java.JavaSparkContext jsc = org.apache.spark.api.java.JavaSparkContext.fromSparkContext(
                spark.sparkContext());
        spark.createDataFrame(jsc.parallelize(cells, Math.max(1, (cells.size() + CELLS_PER_TASK - 1) / CELLS_PER_TASK)),
                CELLS).write().mode(SaveMode.Overwrite).parquet(out + RECURRENCE);
        spark.createDataFrame(spots, SPOTS).coalesce(1).write().mode(SaveMode.Overwrite).parquet(out + HOTSPOTS);
    }
}
