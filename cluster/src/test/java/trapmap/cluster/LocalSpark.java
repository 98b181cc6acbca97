package trapmap.cluster;

import org.apache.spark.sql.SparkSession;

/** A small Spark in local mode for the tests: two cores, few shuffle partitions, no UI, bound to this machine. */
final class LocalSpark {
    private LocalSpark() {
    }

    static SparkSession start() {
        return start("local[2]");
    }

    /** As {@link #start()} with another master, e.g. {@code local[2,3]}: two cores, a task tried up to 3 times. */
    static SparkSession start(String master) {
        return SparkSession.builder().appName("trapmap cluster test").master(master)
                .config("spark.ui.enabled", "false")
                .config("spark.sql.shuffle.partitions", "2")
                .config("spark.driver.host", "localhost")
                .config("spark.driver.bindAddress", "127.0.0.1")
                .getOrCreate();
    }
}
