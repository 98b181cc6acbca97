package trapmap.cluster;

import java.sql.Timestamp;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.regex.Pattern;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.types.DataType;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructField;
import org.apache.spark.sql.types.StructType;
import trapmap.maps.batch.FlaggedRegions;
import trapmap.maps.batch.Footprint;
import trapmap.maps.batch.IronPairRules;
import trapmap.maps.batch.IronPairs;
import trapmap.maps.batch.LotPattern;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.region.Region;

/**
 * One inspected wafer as a Spark row: the columns of {@code inspect}'s {@code results.csv} (the figures of every
 * profile as doubles, NaN/absent as null; the failed and graded-down rules as arrays; the worst region's numbers as
 * doubles, unrounded), then what the results store keeps (the map's SHA-256, its sidecar's facts, lot and measured
 * time) and the partition columns {@code day} and {@code lot}; besides them, for the two other tables, the flagged
 * regions (the columns of {@code regions.csv}) and the footprint. Units are in the column names as in
 * {@code results.csv}.
 */
final class WaferRows implements java.io.Serializable {
    private static final long serialVersionUID = 1L;

    /** The columns of {@code regions.csv} after file and wafer id (and the region's pixels), with their types. */
    static final StructType REGION = new StructType(new StructField[] {
        field("region", DataTypes.IntegerType), field("pixel_count", DataTypes.IntegerType),
        field("area_mm2", DataTypes.DoubleType),
        field("x_mm", DataTypes.DoubleType), field("y_mm", DataTypes.DoubleType),
        field("centroid_x_mm", DataTypes.DoubleType), field("centroid_y_mm", DataTypes.DoubleType),
        field("centroid_inside", DataTypes.BooleanType), field("min_x_mm", DataTypes.DoubleType),
        field("min_y_mm", DataTypes.DoubleType), field("max_x_mm", DataTypes.DoubleType),
        field("max_y_mm", DataTypes.DoubleType), field("peak", DataTypes.DoubleType),
        field("peak_x_mm", DataTypes.DoubleType), field("peak_y_mm", DataTypes.DoubleType),
        field("mean", DataTypes.DoubleType), field("edge_distance_mm", DataTypes.DoubleType),
        field("peak_density_cm3", DataTypes.DoubleType), field("median_density_cm3", DataTypes.DoubleType)});

    /** A footprint ({@link Footprint}): cells of {@code pitch_mm}; the cell sets as {@code BitSet.toByteArray}. */
    static final StructType FOOTPRINT = new StructType(new StructField[] {
        field("family", DataTypes.StringType), field("pitch_mm", DataTypes.DoubleType),
        field("min_i", DataTypes.IntegerType), field("min_j", DataTypes.IntegerType),
        field("width", DataTypes.IntegerType), field("height", DataTypes.IntegerType),
        field("covered", DataTypes.BinaryType), field("flagged", DataTypes.BinaryType)});

    /** The worst region's columns of {@code results.csv}, in order, all doubles but the two named. */
    static final List<String> WORST = List.of("worst_region_area_mm2", "worst_region_x_mm", "worst_region_y_mm",
            "worst_region_peak", "worst_region_rule", "worst_region_centroid_inside", "worst_region_peak_x_mm",
            "worst_region_peak_y_mm", "worst_region_min_x_mm", "worst_region_min_y_mm", "worst_region_max_x_mm",
            "worst_region_max_y_mm");

    /** Column names of the nested regions and footprint (not in the results table). */
    static final String REGIONS = "regions";
    static final String FOOTPRINT_COLUMN = "footprint";

    private final List<String> figures;
    /** The iron columns ({@link IronPairs#columns}), empty without an iron section. */
    private final List<String> ironColumns;
    private final StructType schema;

    /**
     * The rows of wafers judged by {@code rules} (their figures are the columns), with the iron columns of
     * {@code iron} (null: none) after {@code error}: partner, status and notes as text, the failed iron limits as an
     * array, the figures as doubles (cm⁻³; the registration score without unit).
     */
    WaferRows(Rules rules, IronPairRules iron) {
        figures = rules.figures().stream().map(f -> f.name()).toList();
        ironColumns = iron == null ? List.of() : IronPairs.columns(iron);
        List<StructField> f = new ArrayList<>();
        for (String c : List.of("file", "wafer_id", "status", "grade", "profile", "defect")) {
            f.add(field(c, DataTypes.StringType));
        }
        figures.forEach(n -> f.add(field(n, DataTypes.DoubleType)));
        f.add(field("failed_rules", DataTypes.createArrayType(DataTypes.StringType, false)));
        f.add(field("graded_down_by", DataTypes.createArrayType(DataTypes.StringType, false)));
        for (String w : WORST) {
            f.add(field(w, w.equals("worst_region_rule") ? DataTypes.StringType
                    : w.equals("worst_region_centroid_inside") ? DataTypes.BooleanType : DataTypes.DoubleType));
        }
        f.add(field("error", DataTypes.StringType));
        for (String c : ironColumns) {
            f.add(field(c, c.equals(IronPairs.FAILED) ? DataTypes.createArrayType(DataTypes.StringType, false)
                    : IRON_TEXT.contains(c) ? DataTypes.StringType : DataTypes.DoubleType));
        }
        if (!ironColumns.isEmpty()) {
            f.add(field(MAP_VERDICT, VERDICT));
        }
        f.add(field("content_sha256", DataTypes.StringType));
        f.add(field("measured_at", DataTypes.TimestampType));
        f.add(field("attributes", DataTypes.createMapType(DataTypes.StringType, DataTypes.StringType, false)));
        f.add(field(PartitionKey.LOT.column(), DataTypes.StringType));
        f.add(field(PartitionKey.DAY.column(), DataTypes.StringType));
        f.add(field(REGIONS, DataTypes.createArrayType(REGION, false)));
        f.add(field(FOOTPRINT_COLUMN, FOOTPRINT));
        schema = new StructType(f.toArray(StructField[]::new));
    }

    /**
     * With an iron section: the verdict of the map alone, before its pair's is merged ({@code status}, {@code grade},
     * {@code failed_rules}, {@code graded_down_by}), which {@code inspect --store} keeps and {@link StoreLoad} loads.
     */
    static final String MAP_VERDICT = "map_verdict";
    static final StructType VERDICT = new StructType(new StructField[] {
        field("status", DataTypes.StringType), field("grade", DataTypes.StringType),
        field("failed_rules", DataTypes.createArrayType(DataTypes.StringType, false)),
        field("graded_down_by", DataTypes.createArrayType(DataTypes.StringType, false))});

    /** The iron columns that are text. */
    private static final List<String> IRON_TEXT = List.of(IronPairs.PARTNER, IronPairs.STATUS, IronPairs.NOTE);

    /** Whether the rows have the iron columns. */
    boolean withIron() {
        return !ironColumns.isEmpty();
    }

    private static StructField field(String name, DataType type) {
        return DataTypes.createStructField(name, type, true);
    }

    /** Every column, the nested regions and footprint included. */
    StructType schema() {
        return schema;
    }

    /** The facts of a wafer's sidecar that the row keeps besides its result. */
    record Facts(String contentSha256, Map<String, String> attributes) {
    }

    /** The row of one result; {@code lotPattern} (null: none) gives the lot without a {@code lot} fact. */
    Row row(WaferResult r, Facts facts, Pattern lotPattern) {
        List<Object> v = new ArrayList<>(schema.size());
        v.add(r.file());
        v.add(r.waferId());
        v.add(r.status().key());
        v.add(r.grade());
        v.add(r.profile());
        v.add(r.defectId());
        for (String n : figures) {
            Double d = r.figures().get(n);
            v.add(d == null || Double.isNaN(d) ? null : d);
        }
        v.add(seq(r.failed()));
        v.add(seq(r.gradedDownBy()));
        Region w = r.worstRegion();
        if (w == null) {
            WORST.forEach(c -> v.add(null));
        } else {
            v.add(w.areaMm2());
            v.add(w.positionXMm());
            v.add(w.positionYMm());
            v.add(number(w.peakValue()));
            v.add(r.worstRegionRule());
            v.add(w.centroidInside());
            v.add(w.peakXMm());
            v.add(w.peakYMm());
            v.add(w.bounds().minXMm());
            v.add(w.bounds().minYMm());
            v.add(w.bounds().maxXMm());
            v.add(w.bounds().maxYMm());
        }
        v.add(r.error());
        ironColumns.forEach(c -> v.add(null)); // filled by withIron once the pairs are judged
        if (!ironColumns.isEmpty()) {
            v.add(RowFactory.create(r.status().key(), r.grade(), seq(r.failed()), seq(r.gradedDownBy())));
        }
        v.add(facts.contentSha256());
        Map<String, String> attributes = new TreeMap<>(facts.attributes());
        Instant measured = measuredAt(attributes.get("measured_at"));
        String lot = attributes.get("lot");
        if (lot == null || lot.isBlank()) {
            lot = LotPattern.lotOf(lotPattern, r.waferId());
        }
        v.add(measured == null ? null : Timestamp.from(measured));
        v.add(scala.jdk.javaapi.CollectionConverters.asScala(attributes));
        v.add(lot == null || lot.isBlank() ? null : lot);
        v.add(measured == null ? null : measured.atOffset(ZoneOffset.UTC).toLocalDate().toString());
        List<Row> regions = new ArrayList<>(r.regions().size());
        for (FlaggedRegions.FlaggedRegion fr : r.regions()) {
            Region g = fr.region();
            regions.add(RowFactory.create(g.id(), g.pixelCount(), g.areaMm2(), g.positionXMm(), g.positionYMm(), g.centroidXMm(),
                    g.centroidYMm(), g.centroidInside(), g.bounds().minXMm(), g.bounds().minYMm(),
                    g.bounds().maxXMm(), g.bounds().maxYMm(), number(g.peakValue()), g.peakXMm(), g.peakYMm(),
                    number(g.meanValue()), number(g.edgeDistanceMm()), number(fr.peakDensityCm3()),
                    number(fr.medianDensityCm3())));
        }
        v.add(seq(regions));
        Footprint fp = r.footprint();
        v.add(fp == null ? null : RowFactory.create(fp.family(), fp.pitchMm(), fp.minI(), fp.minJ(), fp.width(),
                fp.height(), fp.covered().toByteArray(), fp.flagged().toByteArray()));
        return RowFactory.create(v.toArray());
    }

    /**
     * The row {@code row} of this schema with the iron columns of its file ({@code iron}; empty or null: its name
     * matches neither state's glob) and its verdict as {@code inspect}'s results row has it: merged by the batch's
     * own {@link IronPairs#merge} (a wafer whose pair fails or is in error fails, its fail grade and failed iron
     * limits added).
     */
    Row withIron(Row row, IronPairs.Evaluation iron, Rules rules) {
        Object[] v = new Object[schema.size()]; // the row's first fields are this schema's
        for (int i = 0; i < v.length; i++) {
            v[i] = row.get(i);
        }
        if (iron == null || iron.columns().isEmpty()) {
            return RowFactory.create(v);
        }
        Map<String, String> verdict = new java.util.LinkedHashMap<>();
        for (String c : List.of("status", "grade", "profile")) {
            verdict.put(c, row.getString(schema.fieldIndex(c)));
        }
        verdict.put("failed_rules", String.join(";", row.<String>getList(schema.fieldIndex("failed_rules"))));
        verdict.put("graded_down_by", String.join(";", row.<String>getList(schema.fieldIndex("graded_down_by"))));
        IronPairs.merge(verdict, iron.columns(), rules);
        v[schema.fieldIndex("status")] = verdict.get("status");
        v[schema.fieldIndex("grade")] = verdict.get("grade");
        v[schema.fieldIndex("failed_rules")] = seq(names(verdict.get("failed_rules")));
        v[schema.fieldIndex("graded_down_by")] = seq(names(verdict.get("graded_down_by")));
        for (String c : ironColumns) {
            String text = iron.columns().get(c);
            Object value;
            if (c.equals(IronPairs.FAILED)) {
                value = text == null ? null : seq(names(text));
            } else if (IRON_TEXT.contains(c)) {
                value = text;
            } else {
                Double d = iron.values().get(c);
                value = d == null || d.isNaN() ? null : d;
            }
            v[schema.fieldIndex(c)] = value;
        }
        return RowFactory.create(v);
    }

    /** The names of a {@code ;}-separated list as the batch's row holds it (none for ""). */
    private static List<String> names(String list) {
        return list == null || list.isEmpty() ? List.of() : List.of(list.split(";"));
    }

    /** A list as the Scala sequence a Spark row holds for an array column. */
    private static scala.collection.Seq<?> seq(List<?> list) {
        return scala.jdk.javaapi.CollectionConverters.asScala(list);
    }

    /** NaN (a value that could not be computed) as null, as {@code results.csv} leaves its cell empty. */
    private static Double number(double d) {
        return Double.isNaN(d) ? null : d;
    }

    /**
     * The {@code measured_at} fact as an instant: ISO-8601 with an offset or Z (as the results store reads it); null
     * when absent or not such a time (the wafer is kept without a day).
     */
    static Instant measuredAt(String text) {
        if (text == null) {
            return null;
        }
        try {
            return OffsetDateTime.parse(text.trim()).toInstant();
        } catch (DateTimeParseException e) {
            return null;
        }
    }

    /** The footprint of a footprint row ({@link #FOOTPRINT}). */
    static Footprint footprint(Row f) {
        return new Footprint(f.getString(0), f.getDouble(1), f.getInt(2), f.getInt(3), f.getInt(4), f.getInt(5),
                java.util.BitSet.valueOf((byte[]) f.get(6)), java.util.BitSet.valueOf((byte[]) f.get(7)));
    }
}
