package trapmap.maps.trend;

/**
 * The yield of one group: wafers judged and wafers passed.
 *
 * @param group  the group (lot, day, week or attribute value)
 * @param wafers wafers judged in it
 * @param passed wafers that passed
 */
public record GroupYield(String group, int wafers, int passed) {
    /** passed / wafers, 0–1. */
    public double yield() {
        return wafers == 0 ? Double.NaN : (double) passed / wafers;
    }
}
