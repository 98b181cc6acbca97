package trapmap.viewer.ui.compare;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicReference;
import javax.swing.SwingUtilities;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.WaferMap;
import trapmap.viewer.ui.canvas.MapCanvas;

/** The compare panel runs the comparison off the Event Dispatch Thread and shows its result (headless). */
class ComparePanelTest {
    @BeforeAll
    static void headless() {
        System.setProperty("java.awt.headless", "true");
    }

    @Test
    void comparisonRunsOnAWorkerAndFillsTheThreeViews() throws Exception {
        WaferMap before = CompareModelTest.lifetime("B", 1, 0, 0, 1e14);
        WaferMap after = CompareModelTest.lifetime("A", 0.8, 2, 0, 1e14);
        AtomicReference<ComparePanel> panel = new AtomicReference<>();
        CountDownLatch done = new CountDownLatch(1);
        AtomicReference<Boolean> onEdt = new AtomicReference<>();
        SwingUtilities.invokeAndWait(() -> {
            ComparePanel p = new ComparePanel();
            p.onResult(r -> {
                onEdt.set(SwingUtilities.isEventDispatchThread());
                done.countDown();
            });
            p.setMaps(before, after);
            panel.set(p);
        });
        assertThat(done.await(60, TimeUnit.SECONDS)).isTrue();
        assertThat(onEdt.get()).isTrue();
        SwingUtilities.invokeAndWait(() -> {
            ComparePanel p = panel.get();
            assertThat(p.result()).isNotNull();
            var canvases = p.canvases();
            assertThat(((MapCanvas) canvases.get(0)).map()).isSameAs(p.result().before());
            assertThat(((MapCanvas) canvases.get(1)).map()).isSameAs(p.result().after());
            assertThat(((MapCanvas) canvases.get(2)).map()).isSameAs(p.result().derived(CompareModel.View.DIFFERENCE));
            // one viewport for all three: linked zoom and pan
            assertThat(((MapCanvas) canvases.get(0)).viewport()).isSameAs(((MapCanvas) canvases.get(2)).viewport());
        });
    }
}
