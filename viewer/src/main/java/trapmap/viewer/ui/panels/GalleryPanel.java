package trapmap.viewer.ui.panels;

import java.awt.BasicStroke;
import java.awt.BorderLayout;
import java.awt.Color;
import java.awt.Component;
import java.awt.Dimension;
import java.awt.Graphics;
import java.awt.Graphics2D;
import java.awt.Image;
import java.awt.RenderingHints;
import java.awt.image.BufferedImage;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import javax.swing.BorderFactory;
import javax.swing.DefaultListModel;
import javax.swing.JLabel;
import javax.swing.JList;
import javax.swing.JPanel;
import javax.swing.JScrollPane;
import javax.swing.ListCellRenderer;
import javax.swing.ListSelectionModel;
import javax.swing.UIManager;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.PngStyle;
import trapmap.viewer.model.Units;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.model.Verdict;
import trapmap.viewer.model.WaferAnalysis;

/**
 * The open wafers as cards: thumbnail of the lifetime map, name, verdict (a rules file's outcome, grade and profile, or
 * the quick threshold check's outcome), key figure with its unit, flagged area, and a border green for pass and red
 * for fail (grey while not analysed).
 */
public final class GalleryPanel extends JPanel {
    private static final long serialVersionUID = 1L;
    /** Border colour of a passing wafer. */
    public static final Color PASS = new Color(0x2E8B57);
    /** Border colour of a failing wafer. */
    public static final Color FAIL = new Color(0xD03030);
    private static final int THUMB = 72;

    private final ViewerModel model;
    private final DefaultListModel<ViewerModel.OpenWafer> items = new DefaultListModel<>();
    private final JList<ViewerModel.OpenWafer> list = new JList<>(items);
    private final Map<ViewerModel.OpenWafer, Image> thumbs = new ConcurrentHashMap<>();
    /** Pictures of maps not yet analysed (a PL map before its conversion to lifetime). */
    private final Map<ViewerModel.OpenWafer, Image> drafts = new ConcurrentHashMap<>();
    private final java.util.Set<ViewerModel.OpenWafer> pending = java.util.concurrent.ConcurrentHashMap.newKeySet();
    /** Renders thumbnails off the event thread, one at a time. */
    private static final java.util.concurrent.ExecutorService THUMBNAILS =
            java.util.concurrent.Executors.newSingleThreadExecutor(r -> {
                Thread t = new Thread(r, "trapmap-thumbnails");
                t.setDaemon(true);
                return t;
            });
    private final JLabel header = new JLabel();
    private boolean updating;

    public GalleryPanel(ViewerModel model) {
        super(new BorderLayout());
        this.model = model;
        list.setName("gallery");
        list.setSelectionMode(ListSelectionModel.SINGLE_SELECTION);
        list.setCellRenderer(new Card());
        list.setFixedCellHeight(THUMB + 14);
        list.addListSelectionListener(e -> {
            if (!updating && !e.getValueIsAdjusting() && list.getSelectedIndex() >= 0) {
                model.select(list.getSelectedIndex());
            }
        });
        list.setToolTipText("Open wafers: verdict, key figure with unit and flagged area; green border = pass, red ="
                + " fail, by the rules file or the quick threshold check. PageDown/PageUp step through them.");
        header.setBorder(BorderFactory.createEmptyBorder(6, 8, 6, 8));
        header.setFont(header.getFont().deriveFont(java.awt.Font.BOLD));
        add(header, BorderLayout.NORTH);
        JScrollPane sp = new JScrollPane(list);
        // PageDown/PageUp step through the wafers (the window's keys) rather than scroll this list
        for (String k : new String[] {"PAGE_DOWN", "PAGE_UP", "ctrl PAGE_DOWN", "ctrl PAGE_UP"}) {
            javax.swing.KeyStroke ks = javax.swing.KeyStroke.getKeyStroke(k);
            list.getInputMap(javax.swing.JComponent.WHEN_FOCUSED).put(ks, "none");
            sp.getInputMap(javax.swing.JComponent.WHEN_ANCESTOR_OF_FOCUSED_COMPONENT).put(ks, "none");
        }
        sp.setBorder(BorderFactory.createEmptyBorder());
        add(sp, BorderLayout.CENTER);
        setPreferredSize(new Dimension(285, 400));
        refresh();
    }

    /** Re-reads the list of wafers, the selection and the results. */
    public void refresh() {
        updating = true;
        try {
            if (items.size() != model.size() || !sameWafers()) {
                items.clear();
                model.wafers().forEach(items::addElement);
            }
            int s = model.selectedIndex();
            if (s != list.getSelectedIndex()) {
                if (s < 0) {
                    list.clearSelection();
                } else {
                    list.setSelectedIndex(s);
                    list.ensureIndexIsVisible(s);
                }
            }
        } finally {
            updating = false;
        }
        ViewerModel.Tally t = model.tally();
        header.setName("galleryHeader");
        header.setText("<html>" + waferCount(model.size()) + "<br><span style='font-weight:normal'>" + model.judgedBy()
                + ": " + t.pass() + " pass · " + t.fail() + " fail" + (t.pending() > 0 ? " · " + t.pending()
                + " open" : "") + "</span></html>");
        header.setToolTipText(model.rules() != null ? "Verdicts and grades of the rules file, as trapmap inspect"
                + " gives them (File ▸ Load rules…)" : "Quick threshold check, not a rules verdict: flagged regions"
                + " cover at most the 'pass up to' share of the evaluated area. File ▸ Load rules… judges by a rules"
                + " file as trapmap inspect does.");
        list.repaint();
    }

    private boolean sameWafers() {
        for (int i = 0; i < items.size(); i++) {
            if (items.get(i) != model.wafer(i)) {
                return false;
            }
        }
        return true;
    }

    /** The lifetime picture of a wafer; cached once its lifetime map is known (a PL map needs its analysis). */
    private Image thumbnail(ViewerModel.OpenWafer w) {
        Image cached = thumbs.get(w);
        if (cached != null) {
            return cached;
        }
        boolean done = w.result() != null;
        if (pending.add(w)) {
            THUMBNAILS.execute(() -> {
                Image img = render(w);
                javax.swing.SwingUtilities.invokeLater(() -> {
                    pending.remove(w);
                    if (done || w.result() != null) {
                        thumbs.put(w, img);
                    } else {
                        drafts.put(w, img);
                    }
                    list.repaint();
                });
            });
        }
        return drafts.get(w);
    }

    private static Image render(ViewerModel.OpenWafer k) {
        {
            WaferAnalysis r = k.result();
            BufferedImage full = MapFiles.picture(r != null ? r.lifetime() : k.map(), PngStyle.DEFAULT);
            double s = (double) THUMB / Math.max(full.getWidth(), full.getHeight());
            int tw = Math.max(1, (int) Math.round(full.getWidth() * s));
            int th = Math.max(1, (int) Math.round(full.getHeight() * s));
            BufferedImage t = new BufferedImage(tw, th, BufferedImage.TYPE_INT_ARGB);
            Graphics2D g = t.createGraphics();
            g.setRenderingHint(RenderingHints.KEY_INTERPOLATION, RenderingHints.VALUE_INTERPOLATION_BILINEAR);
            g.drawImage(full, 0, 0, tw, th, null);
            g.dispose();
            return t;
        }
    }

    /** One wafer card. */
    private final class Card extends JPanel implements ListCellRenderer<ViewerModel.OpenWafer> {
        private static final long serialVersionUID = 1L;
        private final JLabel name = new JLabel();
        private final JLabel figure = new JLabel();
        private final JLabel flagged = new JLabel();
        private final JLabel verdict = new JLabel();
        private Image image;
        private Color border;
        private boolean selected;

        Card() {
            setLayout(null);
            add(name);
            add(figure);
            add(flagged);
            add(verdict);
            name.setFont(name.getFont().deriveFont(java.awt.Font.BOLD));
        }

        @Override
        public Component getListCellRendererComponent(JList<? extends ViewerModel.OpenWafer> l,
                                                      ViewerModel.OpenWafer w, int index, boolean isSelected,
                                                      boolean focus) {
            WaferAnalysis r = w.result();
            name.setText(w.name());
            if (w.error() != null) {
                figure.setText("cannot analyse");
                flagged.setText(w.error());
                verdict.setText(" ");
                border = Color.GRAY;
            } else if (r == null) {
                figure.setText("analysing…");
                flagged.setText(" ");
                verdict.setText(" ");
                border = Color.LIGHT_GRAY;
            } else {
                figure.setText(r.key().toString());
                flagged.setText(Units.percent(r.flaggedFraction()) + " flagged · " + r.regions().size()
                        + (r.regions().size() == 1 ? " region" : " regions"));
                border = r.pass() ? PASS : FAIL;
                Verdict v = r.verdict();
                String colour = isSelected ? "#FFFFFF" : v.pass() ? "#2E8B57" : "#D03030";
                // one line, cut at the card's edge: a wrapped second line would be drawn over the key figure
                verdict.setText("<html><nobr><b><font color='" + colour + "'>"
                        + (v.rulesVerdict() ? v.headline() : "quick check: " + v.outcome()) + "</font></b>"
                        + (v.rulesVerdict() ? " · " + v.profile() : "") + (v.defectOverridden() ? " · "
                        + v.defectId() + "*" : "") + "</nobr></html>");
            }
            selected = isSelected;
            image = thumbnail(w);
            Color fg = isSelected ? UIManager.getColor("List.selectionForeground") : l.getForeground();
            name.setForeground(fg);
            figure.setForeground(fg);
            verdict.setForeground(fg);
            flagged.setForeground(isSelected ? fg : UIManager.getColor("Label.disabledForeground"));
            setBackground(isSelected ? UIManager.getColor("List.selectionBackground") : l.getBackground());
            setToolTipText(w.path() + (r == null ? "" : " — " + r.key() + ", flagged area "
                    + Units.percent(r.flaggedFraction()) + "; " + r.verdict().headline() + " — "
                    + r.verdict().basis()));
            return this;
        }

        @Override
        public void doLayout() {
            int x = THUMB + 18;
            int w = Math.max(10, getWidth() - x - 4);
            name.setBounds(x, 4, w, 18);
            verdict.setBounds(x, 22, w, 18);
            figure.setBounds(x, 40, w, 18);
            flagged.setBounds(x, 58, w, 18);
        }

        @Override
        protected void paintComponent(Graphics g) {
            Graphics2D g2 = (Graphics2D) g.create();
            g2.setColor(getBackground());
            g2.fillRect(0, 0, getWidth(), getHeight());
            g2.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
            int x0 = 7;
            int y0 = 7;
            if (image != null) {
                int iw = image.getWidth(null);
                int ih = image.getHeight(null);
                g2.drawImage(image, x0 + (THUMB - iw) / 2, y0 + (THUMB - ih) / 2, null);
            }
            g2.setColor(border);
            g2.setStroke(new BasicStroke(3f));
            g2.drawRoundRect(x0 - 3, y0 - 3, THUMB + 6, THUMB + 6, 8, 8);
            if (!selected) {
                g2.setColor(UIManager.getColor("Separator.foreground"));
                g2.setStroke(new BasicStroke(1f));
                g2.drawLine(0, getHeight() - 1, getWidth(), getHeight() - 1);
            }
            g2.dispose();
        }
    }

    /** Forgets cached thumbnails (after new results). */
    public void clearThumbnails() {
        thumbs.clear();
    }

    /** "1 wafer", "3 wafers". */
    static String waferCount(int n) {
        return n + (n == 1 ? " wafer" : " wafers");
    }
}
