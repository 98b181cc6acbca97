package trapmap.viewer.ui;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.Dimension;
import javax.swing.JPanel;
import org.junit.jupiter.api.Test;

/** A row of fields too wide for its window asks for the lines it wraps onto, so the last ones stay in sight. */
class WrapLayoutTest {
    private static JPanel row() {
        JPanel p = new JPanel(new WrapLayout(6, 2));
        for (int i = 0; i < 4; i++) {
            JPanel box = new JPanel();
            box.setPreferredSize(new Dimension(100, 20));
            p.add(box);
        }
        return p;
    }

    @Test
    void aNarrowRowAsksForTwoLinesAndAWideOneForOne() {
        JPanel narrow = row();
        narrow.setSize(250, 24);
        assertThat(narrow.getPreferredSize().height).as("two lines of 20 px").isEqualTo(2 * 20 + 2 + 2 * 2);
        narrow.doLayout();
        java.awt.Component last = narrow.getComponent(3);
        assertThat(last.getY() + last.getHeight()).as("last box inside the asked height")
                .isLessThanOrEqualTo(narrow.getPreferredSize().height);

        JPanel wide = row();
        wide.setSize(1000, 24);
        assertThat(wide.getPreferredSize().height).isEqualTo(20 + 2 * 2);
        // before it has a width it asks for one line, as a FlowLayout does
        assertThat(row().getPreferredSize()).isEqualTo(new Dimension(4 * 100 + 3 * 6 + 2 * 6, 24));
    }
}
