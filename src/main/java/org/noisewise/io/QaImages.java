package org.noisewise.io;

import ij.ImagePlus;
import ij.gui.OvalRoi;
import ij.gui.Overlay;
import ij.gui.Plot;
import ij.gui.Roi;
import ij.gui.TextRoi;
import ij.plugin.Binner;
import ij.process.FloatProcessor;
import ij.process.ImageProcessor;
import java.awt.Color;
import java.awt.Font;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.util.List;
import javax.imageio.ImageIO;
import org.noisewise.phantom.ActionLimits;
import org.noisewise.phantom.PlacedRegion;
import org.noisewise.phantom.QaLog;

/** Pictures for the QA: the slice with its regions, ImageJ ROIs for the regions, trend plots, PNG bytes. */
public final class QaImages {

    private QaImages() {
    }

    /** One entry of the colour key: what a colour marks. */
    public record KeyEntry(String label, Color colour, String colourName) {
    }

    /** The colour key of the QA regions: the same in the report, the Fiji overlay and the ROI Manager. */
    public static final List<KeyEntry> KEY = List.of(
            new KeyEntry("signal region", Color.yellow, "yellow"),
            new KeyEntry("ghosting (+ bg: also background)", Color.magenta, "magenta"),
            new KeyEntry("background only", Color.cyan, "cyan"),
            new KeyEntry("uniformity high", Color.green, "green"),
            new KeyEntry("uniformity low", Color.orange, "orange"));

    /** The colour key as words, for captions. */
    public static final String LEGEND = String.join(", ", KEY.stream().map(k -> k.label() + " " + k.colourName())
            .toList());

    /** The largest side of a slice drawn in a report. */
    public static final int MAX_SIDE = 1024;

    /** An ImageJ ROI for a placed region, named and coloured by its role. */
    public static Roi roi(PlacedRegion p) {
        Roi r = p.kind() == PlacedRegion.Kind.OVAL ? new OvalRoi(p.x(), p.y(), p.w(), p.h())
                : new Roi(p.x(), p.y(), p.w(), p.h());
        r.setName(p.name());
        r.setStrokeColor(colour(p.name()));
        return r;
    }

    /** A mask as an 8-bit image: 255 where {@code mask} is true, 0 elsewhere. */
    public static ij.process.ByteProcessor maskProcessor(boolean[] mask, int width, int height) {
        byte[] b = new byte[mask.length];
        for (int i = 0; i < mask.length; i++) {
            b[i] = mask[i] ? (byte) 255 : 0;
        }
        return new ij.process.ByteProcessor(width, height, b);
    }

    /** The outline of the 255-valued pixels of an 8-bit mask as one selection, or null when there are none. */
    public static Roi outline(ImageProcessor mask) {
        ImageProcessor ip = mask.duplicate();
        ip.setThreshold(255, 255, ImageProcessor.NO_LUT_UPDATE);
        return ij.plugin.filter.ThresholdToSelection.run(new ImagePlus("mask", ip));
    }

    /** The key colour of a region by its name. */
    public static Color colour(String name) {
        if (name.startsWith("signal")) {
            return KEY.get(0).colour();
        }
        if (name.startsWith("bg")) {
            return KEY.get(2).colour();
        }
        if (name.startsWith("ghost")) {
            return KEY.get(1).colour();
        }
        return name.contains("high") ? KEY.get(3).colour() : KEY.get(4).colour();
    }

    /**
     * The slice with every region drawn and labelled, scaled so the long side is between 384 and
     * {@value #MAX_SIDE} pixels (small images enlarged, large ones reduced, regions drawn at that scale),
     * labels kept inside the picture.
     */
    public static ImagePlus sliceWithRegions(String title, float[] pixels, int width, int height, List<PlacedRegion> regions) {
        return sliceWithRegions(title, pixels, width, height, regions, null);
    }

    /**
     * The display range of a map: from the 1st to the 99th percentile of its finite values inside the
     * object (values above a quarter of the 99th percentile of all), so the object's grey levels show
     * instead of a uniform white disk on black air.
     */
    public static double[] objectRange(float[] v) {
        float[] finite = finite(v);
        if (finite.length == 0) {
            return null;
        }
        java.util.Arrays.sort(finite);
        double top = finite[(int) (0.99 * (finite.length - 1))];
        int from = 0;
        while (from < finite.length && finite[from] < 0.25 * top) {
            from++;
        }
        int n = finite.length - from;
        if (n < 10) {
            return new double[] {finite[0], finite[finite.length - 1]};
        }
        double lo = finite[from + (int) (0.01 * (n - 1))];
        double hi = finite[from + (int) (0.99 * (n - 1))];
        return hi > lo ? new double[] {lo, hi} : null;
    }

    /** The display range of a map of signed or noise-like values: its 1st to 99th percentile. */
    public static double[] percentileRange(float[] v) {
        float[] finite = finite(v);
        if (finite.length == 0) {
            return null;
        }
        java.util.Arrays.sort(finite);
        double lo = finite[(int) (0.01 * (finite.length - 1))];
        double hi = finite[(int) (0.99 * (finite.length - 1))];
        return hi > lo ? new double[] {lo, hi} : null;
    }

    private static float[] finite(float[] v) {
        float[] out = new float[v.length];
        int n = 0;
        for (float x : v) {
            if (Float.isFinite(x)) {
                out[n++] = x;
            }
        }
        return java.util.Arrays.copyOf(out, n);
    }

    /**
     * The slice with its regions, as above, shown over {@code range} (min, max; values outside it black
     * or white), or over its whole range when {@code range} is null; NaN shows black.
     */
    public static ImagePlus sliceWithRegions(String title, float[] pixels, int width, int height, List<PlacedRegion> regions,
                                             double[] range) {
        return sliceWithRegions(title, pixels, width, height, regions, range, null);
    }

    /**
     * As above, with the automatic air (a mask, or null) outlined in the background colour and labelled
     * {@code air (automatic)}.
     */
    public static ImagePlus sliceWithRegions(String title, float[] pixels, int width, int height, List<PlacedRegion> regions,
                                             double[] range, boolean[] air) {
        int side = Math.max(width, height);
        ImageProcessor source = new FloatProcessor(width, height, pixels);
        ImageProcessor ip;
        double scale;
        if (side > MAX_SIDE) {
            // reduced by a whole factor, each output pixel the mean of f x f (ImageJ's Binner; the input is not changed)
            int f = (side + MAX_SIDE - 1) / MAX_SIDE;
            ip = new Binner().shrink(source, f, f, Binner.AVERAGE);
            scale = 1.0 / f;
        } else if (side < 384) {
            scale = Math.ceil(384.0 / side);
            source.setInterpolationMethod(ImageProcessor.NONE);
            ip = source.resize((int) Math.round(width * scale), (int) Math.round(height * scale));
        } else {
            scale = 1.0;
            ip = source.duplicate();
        }
        int sw = ip.getWidth();
        int sh = ip.getHeight();
        if (range != null) {
            ip.setMinAndMax(range[0], range[1]);
        } else {
            ip.resetMinAndMax();
        }
        ImagePlus imp = new ImagePlus(title, ip.convertToByte(true));
        Overlay ov = new Overlay();
        Font font = new Font("SansSerif", Font.PLAIN, 11);
        java.util.Map<String, PlacedRegion> byPlace = new java.util.LinkedHashMap<>();
        for (PlacedRegion p : regions) {
            String where = p.kind() + " " + p.x() + " " + p.y() + " " + p.w() + " " + p.h();
            PlacedRegion before = byPlace.get(where);
            // a side region used both for ghosting and as background is drawn once, with both roles
            byPlace.put(where, before == null ? p : new PlacedRegion(before.name() + " + bg", p.kind(), p.x(), p.y(),
                    p.w(), p.h(), null));
        }
        for (PlacedRegion p : byPlace.values()) {
            PlacedRegion z = new PlacedRegion(p.name(), p.kind(), p.x() * scale, p.y() * scale, p.w() * scale,
                    p.h() * scale, null);
            Roi r = roi(z);
            r.setStrokeWidth(1.5);
            ov.add(r);
            int textW = 7 * p.name().length();
            double lx = Math.max(1, Math.min(sw - textW - 1, z.x() + 2));
            double ly = Math.max(1, Math.min(sh - 14, z.y() + 1));
            TextRoi label = new TextRoi(lx, ly, p.name(), font);
            label.setStrokeColor(colour(p.name()));
            ov.add(label);
        }
        if (air != null) {
            ImageProcessor mask = maskProcessor(air, width, height);
            mask.setInterpolationMethod(ImageProcessor.NONE);
            Roi outline = outline(scale == 1.0 ? mask : mask.resize(sw, sh));
            if (outline != null) {
                outline.setStrokeColor(KEY.get(2).colour());
                outline.setStrokeWidth(1.0);
                ov.add(outline);
                TextRoi label = new TextRoi(2, Math.max(1, sh - 14), "air (automatic)", font);
                label.setStrokeColor(KEY.get(2).colour());
                ov.add(label);
            }
        }
        imp.setOverlay(ov);
        return imp.flatten();
    }

    /**
     * A metric's history against acquisition date with its baseline: the warning band shaded, the
     * centre, the action limits, a published limit; every session a marker on a line through them, the
     * sessions that form the baseline filled; calendar dates on the time axis (ImageJ's numbers would
     * be days since an origin); the key inside the frame, above the data.
     *
     * @param days        each session's acquisition time in days since {@code originDay}
     * @param members     which sessions are baseline members
     * @param originDay   the date day 0 stands for (days since 1970-01-01)
     */
    public static Plot trend(String label, double[] days, double[] values, boolean[] members, QaLog.Baseline b,
                             ActionLimits limits, String metric, long originDay) {
        Plot plot = new Plot("Trend - " + label, "Acquisition date", label);
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        double x0 = 0;
        double x1 = 1;
        for (int i = 0; i < values.length; i++) {
            if (Double.isFinite(values[i])) {
                lo = Math.min(lo, values[i]);
                hi = Math.max(hi, values[i]);
            }
            x1 = Math.max(x1, days[i]);
        }
        double pad = 0.04 * (x1 - x0) + 0.5;
        double[] ends = {x0 - pad, x1 + pad};
        if (b.usable()) {
            lo = Math.min(lo, b.actionLow());
            hi = Math.max(hi, b.actionHigh());
        }
        Double limit = limits == null ? null : metric.equals("uniformity_piu") ? Double.valueOf(limits.minimumPiu())
                : metric.equals("ghosting_percent") ? Double.valueOf(limits.maximumGhostingPercent()) : null;
        if (limit != null) {
            lo = Math.min(lo, limit);
            hi = Math.max(hi, limit);
        }
        if (!(hi >= lo)) {
            lo = 0;
            hi = 1;
        }
        double span = hi > lo ? hi - lo : Math.max(1e-6, Math.abs(hi) * 0.05);
        double bottom = lo - 0.08 * span;
        // room above the data for the two lines of the key
        double top = hi + 0.30 * span;
        plot.setFormatFlags(Plot.Y_NUMBERS | Plot.Y_TICKS | Plot.Y_GRID | Plot.X_TICKS);
        plot.setLimits(ends[0], ends[1], bottom, top);
        if (b.usable()) {
            // the warning band: filled to the bottom of the frame, then the part below it painted over
            plot.setColor(new Color(255, 235, 180), new Color(255, 235, 180));
            plot.add("filled", ends, new double[] {b.warningHigh(), b.warningHigh()});
            plot.setColor(Color.white, Color.white);
            plot.add("filled", ends, new double[] {b.warningLow(), b.warningLow()});
            plot.setColor(new Color(120, 170, 120));
            plot.add("line", ends, new double[] {b.center(), b.center()});
            plot.setColor(new Color(200, 40, 40));
            plot.add("line", ends, new double[] {b.actionLow(), b.actionLow()});
            plot.add("line", ends, new double[] {b.actionHigh(), b.actionHigh()});
        }
        if (limit != null) {
            plot.setColor(Color.black);
            plot.setLineWidth(2);
            plot.add("line", ends, new double[] {limit, limit});
            plot.setLineWidth(1);
        }
        // calendar dates: grid lines and labels at whole-day steps that leave room for each label
        List<Long> ticks = dateTicks(ends[0], ends[1]);
        plot.setColor(new Color(215, 215, 215));
        for (long d : ticks) {
            plot.drawLine(d, bottom, d, top);
        }
        plot.setColor(Color.black);
        plot.setJustification(Plot.CENTER);
        for (long d : ticks) {
            plot.addLabel((d - ends[0]) / (ends[1] - ends[0]), 1.07, java.time.LocalDate.ofEpochDay(originDay + d)
                    .toString());
        }
        plot.setJustification(Plot.LEFT);
        Color sessions = new Color(20, 90, 170);
        plot.setColor(sessions);
        plot.add("line", days, values);
        // open markers for every session; filled ones (fill colour set) for the baseline's members
        plot.setColor(sessions, Color.white);
        plot.add("circle", days, values);
        int m = 0;
        for (boolean k : members) {
            m += k ? 1 : 0;
        }
        double[] mx = new double[m];
        double[] my = new double[m];
        for (int i = 0, k = 0; i < members.length; i++) {
            if (members[i]) {
                mx[k] = days[i];
                my[k++] = values[i];
            }
        }
        if (m > 0) {
            plot.setColor(sessions, sessions);
            plot.add("circle", mx, my);
        }
        plot.setColor(Color.black);
        if (b.usable()) {
            plot.addLabel(0.01, 0.07, String.format(java.util.Locale.ROOT, "sessions: filled = the %d of the baseline",
                    b.sessions()));
            plot.addLabel(0.01, 0.14, "green: centre; shaded: warning band; red: action limits"
                    + (limit != null ? "; black: published limit" : ""));
        } else {
            plot.addLabel(0.01, 0.07, "baseline forming: " + b.sessions() + " of at least " + QaLog.MIN_COMPARE
                    + " sessions");
            if (limit != null) {
                plot.addLabel(0.01, 0.14, "black: published limit");
            }
        }
        return plot;
    }

    /** Day numbers in [from, to] at a whole step of 1, 2, 7, 14, 28, 56, 91, 182 or 364 days, at most 6 of them. */
    static List<Long> dateTicks(double from, double to) {
        long[] steps = {1, 2, 7, 14, 28, 56, 91, 182, 364, 728};
        long step = steps[steps.length - 1];
        for (long s : steps) {
            if ((to - from) / s <= 5.5) {
                step = s;
                break;
            }
        }
        List<Long> out = new java.util.ArrayList<>();
        for (long d = (long) Math.ceil(Math.max(0, from) / step) * step; d <= to; d += step) {
            out.add(d);
        }
        return out;
    }

    /** PNG bytes of an image (flattened with its overlay). */
    public static byte[] png(ImagePlus imp) {
        try (ByteArrayOutputStream out = new ByteArrayOutputStream()) {
            ImageIO.write(imp.getBufferedImage(), "png", out);
            return out.toByteArray();
        } catch (IOException e) {
            throw new IllegalStateException("PNG encoding failed", e);
        }
    }
}
