package trapmap.viewer.model;

import trapmap.maps.model.Quantity;
import trapmap.maps.region.RegionCriteria;

/**
 * What the map view shows. Everything but the measured lifetime needs a defect, since it comes out of the
 * conversion.
 */
public enum DisplayedQuantity {
    LIFETIME("effective lifetime", Quantity.EFFECTIVE_LIFETIME, "τ_eff", 20, RegionCriteria.Side.BELOW),
    TRAP_DENSITY("trap density", Quantity.TRAP_DENSITY, "N_t", 3e11, RegionCriteria.Side.ABOVE),
    OCCUPANCY("occupancy", Quantity.OCCUPANCY, "f_t", 0.5, RegionCriteria.Side.ABOVE),
    SRH_LIFETIME("SRH lifetime", Quantity.SRH_LIFETIME, "τ_SRH", 20, RegionCriteria.Side.BELOW),
    STATUS("pixel status", Quantity.STATUS, "status", 0.5, RegionCriteria.Side.ABOVE),
    /**
     * The probability (0–1) that the pixel's equivalent trap density exceeds the threshold N* of the analysis's
     * {@link ExceedanceSettings}, by Monte Carlo over the defect's parameter spread and the condition and lifetime
     * uncertainties; flagged by default where it is above 0.5.
     */
    EXCEEDANCE_PROBABILITY("probability of exceeding N*", Quantity.EXCEEDANCE_PROBABILITY, "P(N_t > N*)", 0.5,
            RegionCriteria.Side.ABOVE);

    private final String label;
    private final Quantity quantity;
    private final String symbol;
    private final double defaultThreshold;
    private final RegionCriteria.Side defaultSide;

    DisplayedQuantity(String label, Quantity quantity, String symbol, double defaultThreshold,
                      RegionCriteria.Side defaultSide) {
        this.label = label;
        this.quantity = quantity;
        this.symbol = symbol;
        this.defaultThreshold = defaultThreshold;
        this.defaultSide = defaultSide;
    }

    public String label() {
        return label;
    }

    /** The map quantity shown. */
    public Quantity quantity() {
        return quantity;
    }

    /** Short symbol, e.g. {@code N_t}. */
    public String symbol() {
        return symbol;
    }

    /** Unit for display: µs, cm⁻³ or empty. */
    public String unit() {
        return Units.pretty(quantity.unit());
    }

    public boolean needsDefect() {
        return this != LIFETIME;
    }

    /** True for a probability from 0 to 1, coloured on a fixed 0–1 scale unless the user sets a range. */
    public boolean isProbability() {
        return this == EXCEEDANCE_PROBABILITY;
    }

    /** True when values span decades (log slider, log colour scale by default). */
    public boolean logarithmic() {
        return quantity.logarithmic();
    }

    /** A sensible starting threshold in {@link #unit()}: 20 µs below for lifetimes, 3e11 cm⁻³ above for N_t. */
    public double defaultThreshold() {
        return defaultThreshold;
    }

    public RegionCriteria.Side defaultSide() {
        return defaultSide;
    }

    /** The key used in session files, e.g. {@code trap-density}. */
    public String key() {
        return name().toLowerCase(java.util.Locale.ROOT).replace('_', '-');
    }

    /** The quantity with this session key. */
    public static DisplayedQuantity ofKey(String key) {
        for (DisplayedQuantity q : values()) {
            if (q.key().equalsIgnoreCase(key)) {
                return q;
            }
        }
        throw new IllegalArgumentException("unknown quantity '" + key + "'; expected one of lifetime, trap-density,"
                + " occupancy, srh-lifetime, status, exceedance-probability");
    }

    @Override
    public String toString() {
        return label + (unit().isEmpty() ? "" : " (" + unit() + ")");
    }
}
