package trapmap.clusterfixture;

import trapmap.cluster.PartitionKey;

/** An offending fixture for {@code ClusterArchitectureTest}: a class outside the cluster module that uses it. */
public final class UsesTheCluster {
    private UsesTheCluster() {
    }

    public static String column() {
        return PartitionKey.DAY.column();
    }
}
