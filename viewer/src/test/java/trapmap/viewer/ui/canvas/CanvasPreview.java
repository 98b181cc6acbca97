package trapmap.viewer.ui.canvas;

import java.awt.BorderLayout;
import java.awt.geom.Line2D;
import java.util.BitSet;
import javax.swing.JFrame;
import javax.swing.JLabel;
import javax.swing.SwingUtilities;
import com.formdev.flatlaf.FlatLightLaf;
import trapmap.maps.geometry.Fiducial;
import trapmap.maps.geometry.RoundWafer;
import trapmap.maps.io.ColourMap;
import trapmap.maps.model.WaferMap;
import trapmap.viewer.graphics.DisplayStyle;

/**
 * A window with one canvas and its colour bar on a synthetic map, for looking at the canvas by eye.
 * Arguments: map side (default 2048), colour map name (default BLUE_YELLOW), zoom factor over the fitted view or
 * {@code spotN} to show N mm about the darkest planted spot.
 */
public final class CanvasPreview {
    public static void main(String[] args) {
        int n = args.length > 0 ? Integer.parseInt(args[0]) : 2048;
        ColourMap colours = args.length > 1 ? ColourMap.valueOf(args[1]) : ColourMap.BLUE_YELLOW;
        double zoom = args.length > 2 && !args[2].startsWith("spot") ? Double.parseDouble(args[2]) : 1;
        double spotMm = args.length > 2 && args[2].startsWith("spot") ? Double.parseDouble(args[2].substring(4)) : 0;
        WaferMap map = SyntheticMaps.wafer(n);
        BitSet flagged = MapCanvas.flag(map.raster(), null, 150, false);
        SwingUtilities.invokeLater(() -> {
            FlatLightLaf.setup();
            JFrame f = new JFrame("canvas preview");
            MapCanvas canvas = new MapCanvas();
            DisplayStyle style = new DisplayStyle(colours, true, 30, 1000);
            canvas.setMap(map);
            canvas.setStyle(style);
            canvas.setFlagged(flagged);
            canvas.setOutline(RoundWafer.of(156, new Fiducial.Notch(1, 90)), 3);
            canvas.setLine(new Line2D.Double(-60, -10, 50, 40));
            JLabel status = new JLabel(" ");
            canvas.onProbe(p -> status.setText(p == null ? " " : String.format("x %d, y %d px  (%.2f, %.2f mm)  τ = %.1f µs",
                    p.xPx(), p.yPx(), p.xMm(), p.yMm(), p.value())));
            f.add(canvas, BorderLayout.CENTER);
            f.add(new ColourBar(style, "τ (µs)"), BorderLayout.EAST);
            f.add(status, BorderLayout.SOUTH);
            f.setSize(1200, 900);
            f.setDefaultCloseOperation(JFrame.EXIT_ON_CLOSE);
            f.setVisible(true);
            if (spotMm > 0) {
                SwingUtilities.invokeLater(() -> canvas.zoomToMm(30 - spotMm, -20 - spotMm, 30 + spotMm,
                        -20 + spotMm));
            } else if (zoom != 1) {
                SwingUtilities.invokeLater(() -> {
                    canvas.fit();
                    canvas.zoomBy(zoom);
                });
            }
        });
    }
}
