package trapmap.maps.process;

import trapmap.maps.model.WaferMap;
import trapmap.physics.conversion.InjectionSweep;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.shared.error.InvalidValueException;

/** The injection sweep ({@link InjectionSweep}) of one pixel of a map, under the map's conditions. */
public final class PixelInjection {
    private PixelInjection() {
    }

    /**
     * The curves of pixel ({@code xPx}, {@code yPx}) of an effective-lifetime or PL map, converted with the map's
     * conditions ({@link MapConversion#physicsConditions}).
     *
     * @throws InvalidValueException for missing conditions, a pixel without data, or a map of another quantity
     */
    public static InjectionSweep sweep(WaferMap map, int xPx, int yPx, Defect defect, ConversionSettings settings) {
        WaferMap lifetime = switch (map.quantity()) {
            case EFFECTIVE_LIFETIME -> map;
            case PL_COUNTS -> MapConversion.lifetimeFromPl(map);
            default -> throw new InvalidValueException("quantity", "", "an injection curve needs an effective-lifetime"
                    + " or PL map, not " + map.quantity().key());
        };
        if (xPx < 0 || yPx < 0 || xPx >= map.width() || yPx >= map.height()) {
            throw new InvalidValueException("pixel", "px", "pixel (" + xPx + ", " + yPx + ") lies outside the "
                    + map.width() + "x" + map.height() + " px map");
        }
        double tau = lifetime.raster().get(xPx, yPx);
        if (Double.isNaN(tau)) {
            throw new InvalidValueException("pixel", "px", "pixel (" + xPx + ", " + yPx + ") has no data");
        }
        TrapDensityConverter c = new TrapDensityConverter(MapConversion.physicsConditions(lifetime.conditions(),
                settings), defect);
        return InjectionSweep.of(c, tau);
    }

}
