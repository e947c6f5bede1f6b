package dev.dowser.rounds;

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
import java.util.TreeMap;
import javax.imageio.ImageIO;

/**
 * Learning curves as a picture: test accuracy against labels, one line per strategy (the median
 * over seeds) inside a band from the lowest to the highest seed. Drawn once, through a small
 * canvas interface, to SVG and to PNG.
 */
final class CurvePlot {

    static final int WIDTH = 820;
    static final int HEIGHT = 520;
    static final int LEFT = 70;
    static final int RIGHT = 170;
    static final int TOP = 40;
    static final int BOTTOM = 60;
    static final String[] COLOURS = {"#1f7a6d", "#a4452c", "#14213d", "#c79a2e", "#6b4e8c"};

    private CurvePlot() {
    }

    /** Where drawing goes: an SVG document or a raster image. */
    interface Canvas {
        void line(double x1, double y1, double x2, double y2, String colour, double width);

        void polyline(List<double[]> points, String colour, double width);

        void polygon(List<double[]> points, String colour, double opacity);

        void text(double x, double y, String text, int size, boolean end);
    }

    record Curve(Strategy strategy, List<double[]> median, List<double[]> low, List<double[]> high) {
    }

    static List<Curve> curves(List<Simulation.Point> points, List<Strategy> strategies) {
        List<Curve> out = new ArrayList<>();
        for (Strategy s : strategies) {
            TreeMap<Integer, List<Double>> byLabels = new TreeMap<>();
            for (Simulation.Point p : points) {
                if (p.strategy() == s) {
                    byLabels.computeIfAbsent(p.labels(), k -> new ArrayList<>()).add(p.accuracy());
                }
            }
            List<double[]> median = new ArrayList<>();
            List<double[]> low = new ArrayList<>();
            List<double[]> high = new ArrayList<>();
            byLabels.forEach((labels, acc) -> {
                acc.sort(null);
                median.add(new double[] {labels, acc.get(acc.size() / 2)});
                low.add(new double[] {labels, acc.get(0)});
                high.add(new double[] {labels, acc.get(acc.size() - 1)});
            });
            out.add(new Curve(s, median, low, high));
        }
        return out;
    }

    static void draw(Canvas c, List<Curve> curves, int maxLabels) {
        double minAcc = 1;
        for (Curve cv : curves) {
            for (double[] p : cv.low()) {
                minAcc = Math.min(minAcc, p[1]);
            }
        }
        double yLow = Math.max(0, Math.floor(minAcc * 10) / 10);
        double plotW = WIDTH - LEFT - RIGHT;
        double plotH = HEIGHT - TOP - BOTTOM;
        double xScale = plotW / Math.max(1, maxLabels);
        double yScale = plotH / (1 - yLow);
        java.util.function.Function<double[], double[]> at = p -> new double[] {LEFT + p[0] * xScale,
            TOP + (1 - p[1]) * yScale};
        for (int k = 0; k <= 5; k++) {
            double acc = yLow + k * (1 - yLow) / 5;
            double y = TOP + (1 - acc) * yScale;
            c.line(LEFT, y, LEFT + plotW, y, "#dcd6c8", 1);
            c.text(LEFT - 8, y + 4, String.format(Locale.ROOT, "%.2f", acc), 12, true);
        }
        for (int k = 0; k <= 5; k++) {
            double labels = k * maxLabels / 5.0;
            double x = LEFT + labels * xScale;
            c.line(x, TOP + plotH, x, TOP + plotH + 5, "#4a5571", 1);
            c.text(x, TOP + plotH + 20, String.format(Locale.ROOT, "%.0f", labels), 12, false);
        }
        c.line(LEFT, TOP + plotH, LEFT + plotW, TOP + plotH, "#4a5571", 1);
        c.line(LEFT, TOP, LEFT, TOP + plotH, "#4a5571", 1);
        c.text(LEFT + plotW / 2, HEIGHT - 15, "labels", 13, false);
        c.text(LEFT, TOP - 15, "test accuracy (median over seeds; band: lowest to highest)", 13, false);
        for (int i = 0; i < curves.size(); i++) {
            Curve cv = curves.get(i);
            String colour = COLOURS[i % COLOURS.length];
            List<double[]> band = new ArrayList<>();
            cv.high().forEach(p -> band.add(at.apply(p)));
            for (int k = cv.low().size() - 1; k >= 0; k--) {
                band.add(at.apply(cv.low().get(k)));
            }
            c.polygon(band, colour, 0.15);
            List<double[]> line = new ArrayList<>();
            cv.median().forEach(p -> line.add(at.apply(p)));
            c.polyline(line, colour, 2.2);
            double ly = TOP + 20 + i * 22;
            c.line(WIDTH - RIGHT + 20, ly - 4, WIDTH - RIGHT + 44, ly - 4, colour, 3);
            c.text(WIDTH - RIGHT + 50, ly, cv.strategy().word(), 13, false);
        }
    }

    static void writeSvg(Path file, List<Curve> curves, int maxLabels) throws IOException {
        StringBuilder s = new StringBuilder();
        s.append(String.format(Locale.ROOT, "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"%d\" height=\"%d\""
                + " viewBox=\"0 0 %d %d\" font-family=\"sans-serif\">%n<rect width=\"100%%\" height=\"100%%\""
                + " fill=\"#fbf8f1\"/>%n", WIDTH, HEIGHT, WIDTH, HEIGHT));
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
                s.append(String.format(Locale.ROOT, "<text x=\"%.1f\" y=\"%.1f\" font-size=\"%d\" fill=\"#14213d\"%s>",
                        x, y, size, end ? " text-anchor=\"end\"" : ""));
                s.append(text.replace("&", "&amp;").replace("<", "&lt;")).append("</text>\n");
            }
        }, curves, maxLabels);
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

    static void writePng(Path file, List<Curve> curves, int maxLabels) throws IOException {
        BufferedImage img = new BufferedImage(WIDTH, HEIGHT, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setColor(Color.decode("#fbf8f1"));
        g.fillRect(0, 0, WIDTH, HEIGHT);
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
                g.setColor(Color.decode("#14213d"));
                g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, size));
                int w = end ? g.getFontMetrics().stringWidth(text) : 0;
                g.drawString(text, (float) (x - w), (float) y);
            }
        }, curves, maxLabels);
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
