package dev.dowser.simulate;

import dev.dowser.rounds.Strategy;
import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.Path2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import javax.imageio.ImageIO;

/**
 * Learning curves as a picture, one panel per strategy against random (the baseline, grey, in
 * every panel), so that bands never pile up: the median over seeds as a line inside the band of
 * the middle half (the quartiles). Drawn once, through a small canvas, to SVG and to PNG.
 */
final class CurvePlot {

    static final int PANEL_W = 460;
    static final int PANEL_H = 320;
    static final int LEFT = 62;
    static final int RIGHT = 18;
    static final int TOP = 44;
    static final int BOTTOM = 48;
    static final int TITLE = 34;
    static final String INK = "#14213d";
    static final String GRID = "#dcd6c8";
    static final String AXIS = "#4a5571";
    static final String BASELINE = "#8a8a8a";
    static final String[] COLOURS = {"#1f7a6d", "#a4452c", "#2f4b9a", "#b07d12", "#6b4e8c", "#2b7a2b"};

    private CurvePlot() {
    }

    /** Where drawing goes: an SVG document or a raster image. */
    interface Canvas {
        void line(double x1, double y1, double x2, double y2, String colour, double width);

        void polyline(List<double[]> points, String colour, double width);

        void polygon(List<double[]> points, String colour, double opacity);

        void text(double x, double y, String text, int size, boolean end);
    }

    /** What the picture shows. */
    record Figure(String title, LearningCurves curves) {

        List<Strategy> panels() {
            List<Strategy> out = curves.strategies().stream().filter(s -> s != Strategy.RANDOM).toList();
            return out.isEmpty() ? List.of(Strategy.RANDOM) : out;
        }

        int columns() {
            return Math.min(2, panels().size());
        }

        int width() {
            return columns() * PANEL_W;
        }

        int height() {
            int rows = (panels().size() + columns() - 1) / columns();
            return TITLE + rows * PANEL_H;
        }
    }

    static void draw(Canvas c, Figure f) {
        LearningCurves lc = f.curves();
        int[] grid = lc.grid();
        double maxLabels = grid[grid.length - 1];
        double low = 1;
        double high = 0;
        for (Strategy s : lc.strategies()) {
            for (double[] q : lc.quartiles(s)) {
                low = Math.min(low, q[2]);
                high = Math.max(high, q[3]);
            }
        }
        double yLow = Math.max(0, Math.floor(low * 20) / 20);
        double yHigh = Math.min(1, Math.ceil(high * 20) / 20);
        if (yHigh <= yLow) {
            yHigh = Math.min(1, yLow + 0.05);
        }
        c.text(12, 22, f.title(), 15, false);
        List<Strategy> panels = f.panels();
        boolean withBaseline = lc.strategies().contains(Strategy.RANDOM);
        for (int i = 0; i < panels.size(); i++) {
            double x0 = (i % f.columns()) * PANEL_W;
            double y0 = TITLE + (i / f.columns()) * (double) PANEL_H;
            Strategy s = panels.get(i);
            String colour = COLOURS[lc.strategies().indexOf(s) % COLOURS.length];
            panel(c, x0, y0, maxLabels, yLow, yHigh);
            if (withBaseline && s != Strategy.RANDOM) {
                curve(c, lc, Strategy.RANDOM, BASELINE, x0, y0, maxLabels, yLow, yHigh);
            }
            curve(c, lc, s, colour, x0, y0, maxLabels, yLow, yHigh);
            c.line(x0 + LEFT + 8, y0 + TOP - 16, x0 + LEFT + 30, y0 + TOP - 16, colour, 3);
            c.text(x0 + LEFT + 36, y0 + TOP - 12, s.word(), 13, false);
            if (withBaseline && s != Strategy.RANDOM) {
                c.line(x0 + LEFT + 120, y0 + TOP - 16, x0 + LEFT + 142, y0 + TOP - 16, BASELINE, 3);
                c.text(x0 + LEFT + 148, y0 + TOP - 12, "random", 13, false);
            }
        }
    }

    private static void panel(Canvas c, double x0, double y0, double maxLabels, double yLow, double yHigh) {
        double w = PANEL_W - LEFT - RIGHT;
        double h = PANEL_H - TOP - BOTTOM;
        int yTicks = (int) Math.round((yHigh - yLow) / 0.05);
        int step = Math.max(1, yTicks / 6);
        for (int k = 0; k <= yTicks; k += step) {
            double acc = yLow + k * 0.05;
            double y = y0 + TOP + (yHigh - acc) / (yHigh - yLow) * h;
            c.line(x0 + LEFT, y, x0 + LEFT + w, y, GRID, 1);
            c.text(x0 + LEFT - 6, y + 4, String.format(Locale.ROOT, "%.2f", acc), 11, true);
        }
        for (int k = 0; k <= 4; k++) {
            double labels = k * maxLabels / 4;
            double x = x0 + LEFT + labels / maxLabels * w;
            c.line(x, y0 + TOP + h, x, y0 + TOP + h + 4, AXIS, 1);
            c.text(x - 8, y0 + TOP + h + 17, String.format(Locale.ROOT, "%.0f", labels), 11, false);
        }
        c.line(x0 + LEFT, y0 + TOP + h, x0 + LEFT + w, y0 + TOP + h, AXIS, 1);
        c.line(x0 + LEFT, y0 + TOP, x0 + LEFT, y0 + TOP + h, AXIS, 1);
        c.text(x0 + LEFT + w / 2 - 16, y0 + PANEL_H - 12, "labels", 12, false);
    }

    private static void curve(Canvas c, LearningCurves lc, Strategy s, String colour, double x0, double y0,
                              double maxLabels, double yLow, double yHigh) {
        double w = PANEL_W - LEFT - RIGHT;
        double h = PANEL_H - TOP - BOTTOM;
        List<double[]> q = lc.quartiles(s);
        java.util.function.BiFunction<Double, Double, double[]> at = (labels, acc) -> new double[] {
            x0 + LEFT + labels / maxLabels * w,
            y0 + TOP + (yHigh - Math.max(yLow, Math.min(yHigh, acc))) / (yHigh - yLow) * h};
        List<double[]> band = new ArrayList<>();
        q.forEach(p -> band.add(at.apply(p[0], p[3])));
        for (int k = q.size() - 1; k >= 0; k--) {
            band.add(at.apply(q.get(k)[0], q.get(k)[2]));
        }
        c.polygon(band, colour, 0.18);
        List<double[]> line = new ArrayList<>();
        q.forEach(p -> line.add(at.apply(p[0], p[1])));
        c.polyline(line, colour, 2.2);
    }

    static void writeSvg(Path file, Figure f) throws IOException {
        StringBuilder s = new StringBuilder();
        s.append(String.format(Locale.ROOT, "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"%d\" height=\"%d\""
                + " viewBox=\"0 0 %d %d\" font-family=\"sans-serif\">%n<rect width=\"100%%\" height=\"100%%\""
                + " fill=\"#fbf8f1\"/>%n", f.width(), f.height(), f.width(), f.height()));
        draw(new Canvas() {
            @Override
            public void line(double x1, double y1, double x2, double y2, String colour, double width) {
                s.append(String.format(Locale.ROOT, "<line x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\""
                        + " stroke=\"%s\" stroke-width=\"%.1f\"/>%n", x1, y1, x2, y2, colour, width));
            }

            @Override
            public void polyline(List<double[]> points, String colour, double width) {
                s.append("<polyline fill=\"none\" stroke=\"").append(colour).append("\" stroke-width=\"")
                        .append(width).append("\" points=\"").append(points(points)).append("\"/>\n");
            }

            @Override
            public void polygon(List<double[]> points, String colour, double opacity) {
                s.append("<polygon fill=\"").append(colour).append("\" fill-opacity=\"").append(opacity)
                        .append("\" stroke=\"none\" points=\"").append(points(points)).append("\"/>\n");
            }

            @Override
            public void text(double x, double y, String text, int size, boolean end) {
                s.append(String.format(Locale.ROOT, "<text x=\"%.1f\" y=\"%.1f\" font-size=\"%d\" fill=\"%s\"%s>",
                        x, y, size, INK, end ? " text-anchor=\"end\"" : ""));
                s.append(text.replace("&", "&amp;").replace("<", "&lt;")).append("</text>\n");
            }
        }, f);
        s.append("</svg>\n");
        Files.writeString(file, s);
    }

    private static String points(List<double[]> points) {
        StringBuilder s = new StringBuilder();
        for (double[] p : points) {
            s.append(String.format(Locale.ROOT, "%.1f,%.1f ", p[0], p[1]));
        }
        return s.toString().trim();
    }

    static void writePng(Path file, Figure f) throws IOException {
        BufferedImage img = new BufferedImage(f.width(), f.height(), BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setColor(Color.decode("#fbf8f1"));
        g.fillRect(0, 0, f.width(), f.height());
        draw(new Canvas() {
            @Override
            public void line(double x1, double y1, double x2, double y2, String colour, double width) {
                g.setColor(Color.decode(colour));
                g.setStroke(new BasicStroke((float) width));
                g.draw(new java.awt.geom.Line2D.Double(x1, y1, x2, y2));
            }

            @Override
            public void polyline(List<double[]> points, String colour, double width) {
                g.setColor(Color.decode(colour));
                g.setStroke(new BasicStroke((float) width));
                g.draw(path(points, false));
            }

            @Override
            public void polygon(List<double[]> points, String colour, double opacity) {
                Color c = Color.decode(colour);
                g.setColor(new Color(c.getRed(), c.getGreen(), c.getBlue(), (int) (255 * opacity)));
                g.fill(path(points, true));
            }

            @Override
            public void text(double x, double y, String text, int size, boolean end) {
                g.setColor(Color.decode(INK));
                g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, size));
                int w = end ? g.getFontMetrics().stringWidth(text) : 0;
                g.drawString(text, (float) (x - w), (float) y);
            }
        }, f);
        g.dispose();
        ImageIO.write(img, "png", file.toFile());
    }

    private static Path2D path(List<double[]> points, boolean close) {
        Path2D.Double p = new Path2D.Double();
        for (int i = 0; i < points.size(); i++) {
            if (i == 0) {
                p.moveTo(points.get(i)[0], points.get(i)[1]);
            } else {
                p.lineTo(points.get(i)[0], points.get(i)[1]);
            }
        }
        if (close) {
            p.closePath();
        }
        return p;
    }
}
