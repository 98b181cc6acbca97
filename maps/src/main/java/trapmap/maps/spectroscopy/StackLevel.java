package trapmap.maps.spectroscopy;

import trapmap.maps.compare.RegistrationReport;
import trapmap.maps.model.WaferMap;

/**
 * One level of an {@link InjectionStack}.
 *
 * @param label        the page label, or the level's injection (cm^-3) or generation rate (cm^-3 s^-1) as text
 * @param source       the file (and page) the level was read from
 * @param map          the map placed onto the first level's grid (the first level as given)
 * @param registration how the map was placed (turn, mirror, shift in mm, score); null for the first level
 */
public record StackLevel(String label, String source, WaferMap map, RegistrationReport registration) {
    /** Shift of this level against the first, x then y, mm (0, 0 for the first level). */
    public double[] shiftMm() {
        return registration == null ? new double[] {0, 0}
                : new double[] {registration.registration().shiftXMm(), registration.registration().shiftYMm()};
    }

    /** Turn of this level against the first, degrees (0 for the first level). */
    public double rotationDeg() {
        return registration == null ? 0 : registration.registration().rotationDeg();
    }
}
