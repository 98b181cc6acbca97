package trapmap.viewer.model;

import java.util.Locale;
import trapmap.shared.check.Checks;

/**
 * How flagged pixels are drawn over the map: their outline (the edge pixels of the flagged set, from
 * {@link trapmap.maps.raster.Mask#edgePixels}), a fill over them, or not at all, at an opacity from 0.1 to 1. A
 * viewer preference: kept with the recent files ({@link #text()} / {@link #parse}), not in sessions.
 *
 * @param mode    outline, fill or off
 * @param opacity opacity of the overlay, 0.1 (faint) to 1 (opaque)
 */
public record FlagOverlay(Mode mode, double opacity) {
    /** Outline at 90 % opacity: the data inside flagged regions stays visible at every zoom. */
    public static final FlagOverlay DEFAULT = new FlagOverlay(Mode.OUTLINE, 0.9);
    /** Opacities offered in the menu. */
    public static final double[] OPACITIES = {0.25, 0.5, 0.75, 0.9, 1.0};

    /** What is drawn. */
    public enum Mode {
        OUTLINE("outline"), FILL("fill"), OFF("off");

        private final String label;

        Mode(String label) {
            this.label = label;
        }

        /** The name shown in the menu and stored in the preferences. */
        public String label() {
            return label;
        }
    }

    public FlagOverlay {
        Checks.notNull(mode, "overlay mode");
        Checks.inRange(opacity, 0.1, 1, "overlay opacity", "");
    }

    /** The next mode in the order outline → fill → off → outline, same opacity. */
    public FlagOverlay next() {
        Mode[] m = Mode.values();
        return new FlagOverlay(m[(mode.ordinal() + 1) % m.length], opacity);
    }

    public FlagOverlay withMode(Mode m) {
        return new FlagOverlay(m, opacity);
    }

    public FlagOverlay withOpacity(double o) {
        return new FlagOverlay(mode, o);
    }

    /** Stored form, e.g. {@code outline 0.9}. */
    public String text() {
        return mode.label() + " " + opacity;
    }

    /** The overlay of a stored form; {@link #DEFAULT} for null or anything unreadable (an older or edited entry). */
    public static FlagOverlay parse(String text) {
        if (text == null) {
            return DEFAULT;
        }
        String[] p = text.trim().toLowerCase(Locale.ROOT).split("\\s+");
        if (p.length != 2) {
            return DEFAULT;
        }
        for (Mode m : Mode.values()) {
            if (m.label().equals(p[0])) {
                try {
                    double o = Double.parseDouble(p[1]);
                    return o >= 0.1 && o <= 1 ? new FlagOverlay(m, o) : DEFAULT;
                } catch (NumberFormatException e) {
                    return DEFAULT;
                }
            }
        }
        return DEFAULT;
    }

    /**
     * Alpha (0–255) of a screen pixel covering a share {@code flaggedShare} (0–1) of flagged (fill) or edge
     * (outline) map pixels: an outline pixel shows at the full opacity as soon as any edge pixel lies under it, so
     * the line stays one screen pixel wide and visible when zoomed out; a fill grows from 40 % to 100 % of the opacity
     * with the share. 0 where nothing is flagged or the overlay is off.
     */
    public int alpha(double flaggedShare) {
        if (mode == Mode.OFF || !(flaggedShare > 0)) {
            return 0;
        }
        double a = mode == Mode.OUTLINE ? opacity : opacity * (0.4 + 0.6 * Math.min(1, flaggedShare));
        return (int) Math.round(255 * a);
    }
}
