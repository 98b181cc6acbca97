package trapmap.viewer.ui;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.nio.file.Path;
import java.time.LocalDate;
import java.util.List;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import trapmap.maps.io.Caption;
import trapmap.maps.io.CaptionedPicture;
import trapmap.viewer.model.DisplayedQuantity;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.model.WaferAnalysis;

/** The exported view carries a caption strip: wafer, quantity with unit, defect, date. */
class ViewExportCaptionTest {
    private static final Path W03 = Path.of("..", "demo-data", "LOT-A01-W03.tif").toAbsolutePath().normalize();

    @Test
    void exportedViewHasTheCaptionOfTheShownMap() throws Exception {
        ViewerModel m = new ViewerModel();
        m.open(List.of(W03));
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.TRAP_DENSITY), "quantity");
        m.compute(0, () -> false);
        WaferAnalysis r = m.wafer(0).result();
        Caption c = ViewerExports.viewCaption(m.wafer(0), DisplayedQuantity.TRAP_DENSITY,
                r.conversion().defectId(), LocalDate.of(2026, 12, 4));
        assertThat(c.text()).isEqualTo("wafer " + m.wafer(0).map().waferId()
                + "  ·  trap-density (cm⁻³)  ·  defect fe-i  ·  2026-12-04");
        assertThat(ViewerExports.viewCaption(m.wafer(0), DisplayedQuantity.LIFETIME, "fe-i", null).text())
                .isEqualTo("wafer " + m.wafer(0).map().waferId() + "  ·  effective-lifetime (µs)");

        BufferedImage view = new BufferedImage(420, 260, BufferedImage.TYPE_INT_RGB); // black: the map and its bar
        BufferedImage png = ImageIO.read(new ByteArrayInputStream(ViewerExports.viewPng(view, c)));
        assertThat(png.getWidth()).isEqualTo(420);
        assertThat(png.getHeight()).isEqualTo(260 + CaptionedPicture.STRIP_PX);
        int ink = 0;
        for (int y = 260; y < png.getHeight(); y++) {
            for (int x = 0; x < png.getWidth(); x++) {
                ink += (png.getRGB(x, y) & 0xFFFFFF) != CaptionedPicture.BACKGROUND_RGB ? 1 : 0;
            }
        }
        assertThat(ink).as("caption text pixels").isGreaterThan(100);
    }
}
