package trapmap.viewer.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.Ellipse2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import javax.imageio.ImageIO;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.Figure;
import trapmap.maps.batch.Rules;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.WaferMap;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.graphics.Labels;

/**
 * The failed wafers, worst first (most failed rules, then the largest flagged area fraction), at most
 * {@value #SHOWN} of them, each with its thumbnail (or its map with the worst region circled), its profile, failed
 * rules, worst region and the figures its profile uses. Says how many of the failed wafers it shows.
 */
final class FailedWafersSection {
    /** Failed wafers shown with pictures. */
    static final int SHOWN = 6;
    private static final float CELL_H = 236;
    private static final float PICTURE = 150;

    private FailedWafersSection() {
    }

    static void draw(ReportFlow flow, BatchContent c) throws IOException {
        draw(flow, c, r -> null);
    }

    /** The pictures of some wafers' cards made ahead ({@link #picture(Path, BatchContent.Row)}); null: none. */
    @FunctionalInterface
    interface Pictures {
        Optional<PdfPage.Picture> made(BatchContent.Row r);
    }

    /** As {@link #draw(ReportFlow, BatchContent)}, with the cards' pictures {@code made} ahead where there are. */
    static void draw(ReportFlow flow, BatchContent c, Pictures made) throws IOException {
        List<BatchContent.Row> failed = c.failedWorstFirst();
        if (failed.isEmpty()) {
            return;
        }
        List<BatchContent.Row> shown = failed.subList(0, Math.min(SHOWN, failed.size()));
        flow.part("Failed wafers, worst first: showing " + shown.size() + " of " + failed.size());
        flow.paragraph("Most failed rules first, then the largest flagged area fraction"
                + (failed.size() - shown.size() == 1 ? "; the other failed wafer is in the wafer table"
                : shown.size() < failed.size() ? "; the other " + (failed.size() - shown.size()) + " failed wafers"
                + " are in the wafer table" : "") + ". " + pictures(c.outputDir(), shown) + " Worst region: as in the"
                + " wafer table.", PdfPage.REGULAR, 8.5f);
        float full = ReportFlow.FULL;
        float cw = (full - 12) / 2;
        for (int i = 0; i < shown.size(); i += 2) {
            flow.need(CELL_H);
            for (int k = i; k < Math.min(i + 2, shown.size()); k++) {
                BatchContent.Row r = shown.get(k);
                Optional<PdfPage.Picture> picture = made.made(r);
                if (picture == null) {
                    picture = picture(c.outputDir(), r);
                }
                card(flow.page(), c, r, picture, ReportFlow.LEFT + (k - i) * (cw + 12), flow.y(), cw);
            }
            flow.down(CELL_H);
        }
    }

    /** What the cards' pictures of {@code shown} are: thumbnails, maps drawn from their files, or both. */
    static String pictures(Path outDir, List<BatchContent.Row> shown) {
        long thumbnails = shown.stream().filter(r -> Files.isRegularFile(thumbnail(outDir, r))).count();
        String thumbnail = "thumbnails (lifetime over its 1st-99th percentile, dark: short; magenta: flagged regions)";
        String map = "the map as read, with a magenta circle around the worst region";
        if (thumbnails == shown.size()) {
            return "Pictures: " + thumbnail + ".";
        }
        if (thumbnails == 0) {
            return "Pictures: " + map + ".";
        }
        return "Pictures: " + thumbnail + "; without a thumbnail, " + map + ".";
    }

    private static Path thumbnail(Path outDir, BatchContent.Row r) {
        return outDir.resolve(BatchInspection.THUMBNAIL_DIR).resolve(Path.of(r.file()).getFileName() + ".png");
    }

    /** The picture of {@code r}'s card in a batch folder {@code outDir}, ready to embed; empty when there is none. */
    static Optional<PdfPage.Picture> picture(Path outDir, BatchContent.Row r) {
        BufferedImage img = picture(outDir, r, (int) (PICTURE * BatchReport.SCALE));
        return img == null ? Optional.empty() : Optional.of(PdfPage.Picture.of(img));
    }

    private static void card(PdfPage p, BatchContent c, BatchContent.Row r, Optional<PdfPage.Picture> img, float x,
                             float top, float cw) throws IOException {
        p.rect(x, top, cw, CELL_H - 8, PdfPage.RULE, null, 0.6f);
        if (img.isPresent()) {
            p.image(img.get(), x + 6, top + 6, PICTURE, PICTURE);
        } else {
            p.paragraph("no picture: the map could not be read again", x + 6, top + 6, PICTURE, PdfPage.REGULAR, 8);
        }
        float tx = x + PICTURE + 14;
        float tw = cw - PICTURE - 20;
        p.text(PdfPage.fit(r.name(), PdfPage.BOLD, 10, tw), tx, top + 8, PdfPage.BOLD, 10);
        p.text(PdfPage.fit(Path.of(r.file()).getFileName().toString(), PdfPage.REGULAR, 7, tw), tx, top + 21,
                PdfPage.REGULAR, 7, PdfPage.MUTED);
        p.text(r.status().toUpperCase(Locale.ROOT) + (r.grade().isEmpty() ? "" : ", grade " + r.grade()), tx,
                top + 32, PdfPage.BOLD, 9, r.status().equals("pass") ? SummarySection.PASS : SummarySection.FAIL);
        float ty = top + 46;
        ty += p.paragraph("profile " + r.profile() + (r.defect().isEmpty() ? "" : ", defect " + r.defect()), tx, ty,
                tw, PdfPage.REGULAR, 7.5f);
        if (!r.failed().isEmpty()) {
            ty += p.paragraph("failed: " + String.join(", ", r.failed().stream().map(Figure::readable).toList()), tx,
                    ty, tw, PdfPage.REGULAR, 7.5f);
        }
        Rules.Profile prof = c.profile(r.profile());
        String flagUnit = prof == null ? "" : prof.flag().regionUnit();
        if (Double.isFinite(r.worstAreaMm2())) {
            p.paragraph("worst region " + Labels.number(r.worstAreaMm2()) + " " + Typeset.MM2 + " at "
                    + WaferTable.position(r) + " mm, peak " + Labels.number(r.worstPeak(), flagUnit), tx, ty, tw,
                    PdfPage.REGULAR, 7.5f);
        } else {
            p.paragraph("no flagged region", tx, ty, tw, PdfPage.REGULAR, 7.5f);
        }
        List<String[]> figs = new ArrayList<>();
        for (String f : ProfileSection.figures(prof, List.of(r))) {
            String u = DistributionChart.unitOf(f);
            String v = Labels.number(r.figure(f)) + (u.isEmpty() ? "" : " " + u)
                    + (DistributionChart.isTrapDensity(f) && !r.defect().isEmpty() ? " " + r.defect() : "");
            figs.add(new String[] {DistributionChart.what(f), v});
        }
        figures(p, figs, x + 6, top + PICTURE + 12, cw - 12, top + CELL_H - 12);
    }

    /**
     * The card's figures: names wrapped onto at most two lines inside the card, values right-aligned; when the
     * card's bottom ({@code bottom}) comes first, the last line says how many figures are shown.
     */
    static void figures(PdfPage p, List<String[]> figs, float x, float y, float width, float bottom)
            throws IOException {
        float size = 7;
        float leading = size * 1.35f;
        float nameW = width * 0.58f - 4;
        float valueRight = x + width - 2;
        int shown = 0;
        for (String[] f : figs) {
            List<String> name = PdfPage.wrap(f[0], PdfPage.REGULAR, size, nameW, 2);
            boolean last = shown == figs.size() - 1;
            if (y + (name.size() + (last ? 0 : 1)) * leading > bottom) {
                break;
            }
            for (int i = 0; i < name.size(); i++) {
                p.text(name.get(i), x, y + i * leading, PdfPage.REGULAR, size);
            }
            p.textRight(PdfPage.fit(f[1], PdfPage.REGULAR, size, width - nameW - 8), valueRight, y,
                    PdfPage.REGULAR, size);
            y += name.size() * leading;
            shown++;
        }
        if (shown < figs.size()) {
            p.text("showing " + shown + " of " + figs.size() + " figures", x, y, PdfPage.REGULAR, size,
                    PdfPage.MUTED);
        }
    }

    /** The wafer's thumbnail, or its map drawn with the worst region circled; null when neither exists. */
    private static BufferedImage picture(Path outDir, BatchContent.Row r, int size) {
        Path thumb = thumbnail(outDir, r);
        try {
            if (Files.isRegularFile(thumb)) {
                BufferedImage t = ImageIO.read(thumb.toFile());
                if (t != null) {
                    return onWhite(t, size);
                }
            }
            WaferMap m = MapFiles.readSingle(Path.of(r.file()));
            DisplayStyle style = MapPicture.styleOf(m, null);
            BufferedImage img = MapPicture.render(m, style, null, null, 0, size);
            if (Double.isFinite(r.worstAreaMm2())) {
                double scale = Math.min((double) size / m.width(), (double) size / m.height());
                double ox = (size - m.width() * scale) / 2;
                double oy = (size - m.height() * scale) / 2;
                double cx = ox + (m.grid().xPx(r.worstXMm()) + 0.5) * scale;
                double cy = oy + (m.grid().yPx(r.worstYMm()) + 0.5) * scale;
                double radius = Math.max(6, 1.3 * Math.sqrt(r.worstAreaMm2() / Math.PI) / m.grid().pitchMm() * scale);
                Graphics2D g = img.createGraphics();
                g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
                g.setColor(MapPicture.FLAG);
                g.setStroke(new BasicStroke(3f));
                g.draw(new Ellipse2D.Double(cx - radius, cy - radius, 2 * radius, 2 * radius));
                g.dispose();
            }
            return img;
        } catch (IOException | RuntimeException e) {
            return null;
        }
    }

    private static BufferedImage onWhite(BufferedImage t, int size) {
        BufferedImage out = new BufferedImage(size, size, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = out.createGraphics();
        g.setColor(Color.WHITE);
        g.fillRect(0, 0, size, size);
        double s = Math.min((double) size / t.getWidth(), (double) size / t.getHeight());
        int w = (int) Math.round(t.getWidth() * s);
        int h = (int) Math.round(t.getHeight() * s);
        g.setRenderingHint(RenderingHints.KEY_INTERPOLATION, RenderingHints.VALUE_INTERPOLATION_NEAREST_NEIGHBOR);
        g.drawImage(t, (size - w) / 2, (size - h) / 2, w, h, null);
        g.dispose();
        return out;
    }
}
