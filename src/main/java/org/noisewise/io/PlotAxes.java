package org.noisewise.io;

import ij.gui.Plot;
import java.awt.Color;
import java.math.BigDecimal;
import java.math.MathContext;
import java.util.ArrayList;
import java.util.List;

/**
 * Axis ranges and labels for the project's plots: data never touch the frame (a margin on every
 * side), and logarithmic axes carry plain numbers at 1, 2, 5, 10, 20, ... (ImageJ's own log axes
 * print powers of ten such as {@code 2·10^0}, which physicists do not read at a glance). A log-log
 * plot draws the base-10 logarithms of its data on linear axes, with its own grid lines and labels.
 */
public final class PlotAxes {

    /** Fraction of the data range left free on each side. */
    static final double MARGIN = 0.06;
    private static final Color GRID = new Color(215, 215, 215);

    private PlotAxes() {
    }

    /** Linear limits around every finite value of the given arrays, with a margin on each side. */
    public static void fit(Plot p, double[][] xs, double[][] ys, boolean yFromZero) {
        double[] x = range(xs);
        double[] y = range(ys);
        if (yFromZero) {
            y[0] = Math.min(0, y[0]);
        }
        double dy = y[1] > y[0] ? y[1] - y[0] : Math.max(1e-12, Math.abs(y[0]));
        double dx = x[1] > x[0] ? x[1] - x[0] : 1;
        p.setLimits(x[0] - (x[1] > x[0] ? 0 : 0.5 * dx), x[1] + (x[1] > x[0] ? 0 : 0.5 * dx),
                yFromZero && y[0] == 0 ? 0 : y[0] - MARGIN * dy, y[1] + MARGIN * dy);
    }

    private static double[] range(double[][] arrays) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double[] a : arrays) {
            for (double v : a) {
                if (Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
        }
        return Double.isFinite(lo) ? new double[] {lo, hi} : new double[] {0, 1};
    }

    /** The base-10 logarithms (NaN for values that are not positive). */
    public static double[] log(double[] v) {
        double[] out = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            out[i] = v[i] > 0 ? Math.log10(v[i]) : Double.NaN;
        }
        return out;
    }

    /**
     * Sets up a plot whose data are drawn as {@link #log} values on both axes: limits with a margin,
     * ImageJ's own numbers and grid off, grid lines and plain-number labels at 1-2-5 steps (every whole
     * step 1..9 of a decade when the range holds fewer than three of those).
     *
     * @param xs the x data (not logarithms), for the range
     * @param ys the y data (not logarithms), for the range
     */
    public static void logLog(Plot p, double[][] xs, double[][] ys) {
        double[] x = logRange(xs);
        double[] y = logRange(ys);
        double mx = MARGIN * (x[1] - x[0]);
        double my = MARGIN * (y[1] - y[0]);
        double x0 = x[0] - mx;
        double x1 = x[1] + mx;
        double y0 = y[0] - my;
        double y1 = y[1] + my;
        p.setFormatFlags(Plot.X_TICKS | Plot.Y_TICKS);
        p.setLimits(x0, x1, y0, y1);
        Color was = Color.black;
        p.setColor(GRID);
        List<Double> xt = ticks(Math.pow(10, x0), Math.pow(10, x1));
        List<Double> yt = ticks(Math.pow(10, y0), Math.pow(10, y1));
        for (double v : xt) {
            p.drawLine(Math.log10(v), y0, Math.log10(v), y1);
        }
        for (double v : yt) {
            p.drawLine(x0, Math.log10(v), x1, Math.log10(v));
        }
        p.setColor(Color.black);
        p.setJustification(Plot.CENTER);
        for (double v : xt) {
            p.addLabel((Math.log10(v) - x0) / (x1 - x0), 1.07, label(v));
        }
        // y labels inside the frame, just above their grid line, so they never meet the axis title
        p.setJustification(Plot.LEFT);
        for (double v : yt) {
            double ny = 1 - (Math.log10(v) - y0) / (y1 - y0);
            if (ny > 0.06) {
                p.addLabel(0.008, ny - 0.012, label(v));
            }
        }
        p.setColor(was);
    }

    private static double[] logRange(double[][] arrays) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double[] a : arrays) {
            for (double v : a) {
                if (v > 0 && Double.isFinite(v)) {
                    lo = Math.min(lo, Math.log10(v));
                    hi = Math.max(hi, Math.log10(v));
                }
            }
        }
        if (!Double.isFinite(lo)) {
            return new double[] {0, 1};
        }
        if (hi - lo < 0.3) {
            double c = 0.5 * (hi + lo);
            lo = c - 0.15;
            hi = c + 0.15;
        }
        return new double[] {lo, hi};
    }

    /** Tick values at 1, 2, 5 x 10^k in [lo, hi]; every whole step when that gives fewer than three. */
    static List<Double> ticks(double lo, double hi) {
        List<Double> t = steps(lo, hi, new double[] {1, 2, 5});
        return t.size() >= 3 ? t : steps(lo, hi, new double[] {1, 2, 3, 4, 5, 6, 7, 8, 9});
    }

    private static List<Double> steps(double lo, double hi, double[] mantissas) {
        List<Double> out = new ArrayList<>();
        for (int e = (int) Math.floor(Math.log10(lo)) - 1; e <= (int) Math.ceil(Math.log10(hi)); e++) {
            for (double m : mantissas) {
                double v = new BigDecimal(m).scaleByPowerOfTen(e).doubleValue();
                if (v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9)) {
                    out.add(v);
                }
            }
        }
        return out;
    }

    /** A plain number: 0.05, 0.2, 1, 20, 500 (no powers of ten). */
    static String label(double v) {
        return new BigDecimal(v).round(new MathContext(3)).stripTrailingZeros().toPlainString();
    }
}
