package trapmap.viewer.model;

import trapmap.physics.conversion.PixelResult;

/**
 * What the cursor readout shows for one pixel.
 *
 * @param xMm       pixel centre x, mm
 * @param yMm       pixel centre y, mm
 * @param quantity  displayed quantity
 * @param value     displayed value at the pixel, in the quantity's unit (NaN: no data)
 * @param lifetimeUs effective lifetime at the pixel, µs
 * @param pixel     the single-pixel conversion for the chosen defect, or null without one
 * @param exceedance the probability of exceeding N* and the quantiles of N_t at the pixel, or null without a defect
 */
public record PixelReadout(double xMm, double yMm, DisplayedQuantity quantity, double value, double lifetimeUs,
                           PixelResult pixel, Exceedance exceedance) {

    /** A readout without the exceedance line. */
    public PixelReadout(double xMm, double yMm, DisplayedQuantity quantity, double value, double lifetimeUs,
                        PixelResult pixel) {
        this(xMm, yMm, quantity, value, lifetimeUs, pixel, null);
    }

    /**
     * The uncertainty readout of one pixel.
     *
     * @param thresholdPerCm3 N*, cm⁻³
     * @param probability     P(N_t &gt; N*), 0–1 (NaN: not convertible or not available)
     * @param lowPerCm3       the {@value ExceedanceSettings#LOW_QUANTILE} quantile of N_t, cm⁻³
     * @param highPerCm3      the {@value ExceedanceSettings#HIGH_QUANTILE} quantile of N_t, cm⁻³
     * @param note            why there are no values (e.g. a fixed generation rate), or null
     */
    public record Exceedance(double thresholdPerCm3, double probability, double lowPerCm3, double highPerCm3,
                             String note) {
        /** One line, e.g. {@code P(N_t > 3e11 cm⁻³) 0.82   N_t 5–95 % [2.1e11 – 6.3e11] cm⁻³}. */
        public String describe() {
            if (note != null) {
                return note;
            }
            String p = "P(N_t > " + Units.number(thresholdPerCm3) + " cm⁻³) ";
            if (Double.isNaN(probability)) {
                return p + "–";
            }
            if (Double.isNaN(lowPerCm3) && Double.isNaN(highPerCm3)) {
                return p + String.format(java.util.Locale.ROOT, "%.3f", probability)
                        + "   (N_t quantiles need a fixed injection level)";
            }
            return p + String.format(java.util.Locale.ROOT, "%.3f", probability) + "   N_t "
                    + Math.round(ExceedanceSettings.LOW_QUANTILE * 100) + "–"
                    + Math.round(ExceedanceSettings.HIGH_QUANTILE * 100) + " % [" + Units.number(lowPerCm3) + " – "
                    + Units.number(highPerCm3) + "] cm⁻³";
        }
    }
    /** One line for the status bar, units with every value. */
    public String describe() {
        StringBuilder sb = new StringBuilder(String.format(java.util.Locale.ROOT, "x %.1f mm, y %.1f mm   %s %s",
                xMm, yMm, quantity.symbol(), quantity == DisplayedQuantity.STATUS && !Double.isNaN(value)
                        ? trapmap.physics.conversion.PixelStatus.ofCode((int) value).name()
                        : Units.withUnit(value, quantity.unit())));
        if (pixel != null && !Double.isNaN(lifetimeUs)) {
            sb.append("   Δn ").append(Units.withUnit(pixel.injectionPerCm3(), "cm^-3"))
                    .append("   τ_SRH ").append(Units.withUnit(pixel.srhLifetimeUs(), "µs"))
                    .append("   N_t ").append(Units.number(pixel.trapDensityPerCm3()))
                    .append(" [").append(Units.number(pixel.trapDensityMinPerCm3())).append(" – ")
                    .append(Units.number(pixel.trapDensityMaxPerCm3())).append("] cm⁻³")
                    .append("   f_t ").append(Units.number(pixel.occupancy()))
                    .append("   ").append(pixel.status().name());
        }
        if (exceedance != null && !Double.isNaN(lifetimeUs)) {
            sb.append("   ").append(exceedance.describe());
        }
        return sb.toString();
    }
}
