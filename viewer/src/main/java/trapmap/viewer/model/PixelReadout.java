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
 */
public record PixelReadout(double xMm, double yMm, DisplayedQuantity quantity, double value, double lifetimeUs,
                           PixelResult pixel) {
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
        return sb.toString();
    }
}
