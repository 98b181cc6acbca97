package trapmap.viewer.ui;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.ui.panels.StatusBar;

class AnalysisRunnerTest {
    @Test
    void escapeWithNothingRunningSaysNothing() {
        StatusBar status = new StatusBar(() -> { });
        status.setMessage("opened 3 maps");
        AnalysisRunner runner = new AnalysisRunner(new ViewerModel(), status, () -> { });
        assertThat(runner.idle()).isTrue();
        assertThat(runner.cancel()).isFalse();
        assertThat(status.message()).isEqualTo("opened 3 maps");
    }

    @Test
    void cancellingAWaitingAnalysisStopsItAndSaysSo() {
        StatusBar status = new StatusBar(() -> { });
        AnalysisRunner runner = new AnalysisRunner(new ViewerModel(), status, () -> { });
        runner.schedule();
        assertThat(runner.idle()).isFalse();
        assertThat(runner.cancel()).isTrue();
        assertThat(runner.idle()).as("the waiting run does not start afterwards").isTrue();
        assertThat(status.message()).isEqualTo("cancelled: some wafers show older results");
    }
}
