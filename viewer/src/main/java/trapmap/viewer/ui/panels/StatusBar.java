package trapmap.viewer.ui.panels;

import java.awt.BorderLayout;
import java.awt.Dimension;
import java.awt.FlowLayout;
import javax.swing.BorderFactory;
import javax.swing.JButton;
import javax.swing.JLabel;
import javax.swing.JPanel;
import javax.swing.JProgressBar;
import javax.swing.UIManager;

/**
 * The bottom line: cursor readout, messages, last frame time, progress with a cancel button. The readout keeps its
 * full width; a message too long for the rest is cut with "…" (its full text is the tooltip).
 */
public final class StatusBar extends JPanel {
    private static final long serialVersionUID = 1L;
    private final JLabel readout = new JLabel(" ");
    private final JLabel message = new JLabel(" ");
    private final JLabel frame = new JLabel("frame – ms");
    private final JProgressBar progress = new JProgressBar(0, 100);
    private final JButton cancel = new JButton("Cancel");

    public StatusBar(Runnable onCancel) {
        super(new BorderLayout(8, 0));
        setBorder(BorderFactory.createCompoundBorder(
                BorderFactory.createMatteBorder(1, 0, 0, 0, UIManager.getColor("Separator.foreground")),
                BorderFactory.createEmptyBorder(3, 8, 3, 8)));
        readout.setToolTipText("Value under the cursor with its unit; with a defect also Δn (cm⁻³), τ_SRH (µs),"
                + " N_t with its bounds over the published parameter spread (cm⁻³), occupancy f_t and pixel status");
        readout.setName("readout");
        message.setName("message");
        add(readout, BorderLayout.WEST);
        message.setHorizontalAlignment(JLabel.RIGHT);
        message.setMinimumSize(new Dimension(0, 0));
        add(message, BorderLayout.CENTER);
        JPanel right = new JPanel(new FlowLayout(FlowLayout.RIGHT, 8, 0));
        frame.setToolTipText("Paint time of the last map frame, ms");
        right.add(frame);
        progress.setPreferredSize(new Dimension(120, 18));
        progress.setStringPainted(true);
        progress.setToolTipText("Progress of the conversion and analysis of the open wafers");
        progress.setVisible(false);
        right.add(progress);
        cancel.setToolTipText("Stop the running conversion (the map keeps its last results)");
        cancel.addActionListener(e -> onCancel.run());
        cancel.setVisible(false);
        cancel.putClientProperty("JButton.buttonType", "borderless");
        right.add(cancel);
        add(right, BorderLayout.EAST);
    }

    public void setReadout(String text) {
        readout.setText(text == null || text.isEmpty() ? " " : text);
        revalidate();
    }

    public void setMessage(String text) {
        message.setText(text == null || text.isEmpty() ? " " : text);
        message.setToolTipText(text);
        revalidate();
    }

    /** The readout label (tests: its width after layout). */
    JLabel readoutLabel() {
        return readout;
    }

    /** The message label (tests). */
    JLabel messageLabel() {
        return message;
    }

    /** The message shown (a blank when none). */
    public String message() {
        return message.getText();
    }

    /** A longer text for the message's tooltip. */
    public void setMessageTooltip(String text) {
        message.setToolTipText(text);
    }

    public void setFrameMillis(double ms) {
        frame.setText(Double.isNaN(ms) ? "frame – ms" : String.format(java.util.Locale.ROOT, "frame %.1f ms", ms));
    }

    /** Shows progress (0–100 %) with the cancel button; {@code percent < 0} hides both. */
    public void setProgress(int percent, String label) {
        boolean on = percent >= 0;
        progress.setVisible(on);
        cancel.setVisible(on);
        if (on) {
            progress.setValue(percent);
            progress.setString(label);
        }
    }
}
