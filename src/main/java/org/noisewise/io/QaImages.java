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

    /** The colour of each kind of region, as drawn and as the captions name it. */
    public static final String LEGEND = "signal region yellow, ghosting regions (also background, where marked + bg) "
            + "magenta, background-only regions cyan, uniformity high green, uniformity low orange";

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

    static Color colour(String name) {
        if (name.startsWith("signal")) {
            return Color.yellow;
        }
        if (name.startsWith("bg")) {
            return Color.cyan;
        }
        if (name.startsWith("ghost")) {
            return Color.magenta;
        }
        return name.contains("high") ? Color.green : Color.orange;
    }

    /**
     * The slice with every region drawn and labelled, scaled so the long side is between 384 and
     * {@value #MAX_SIDE} pixels (small images enlarged, large ones reduced, regions drawn at that scale),
     * labels kept inside the picture.
     */
    public static ImagePlus sliceWithRegions(String title, float[] pixels, int width, int height, List<PlacedRegion> regions) {
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
        ip.resetMinAndMax();
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
        imp.setOverlay(ov);
        return imp.flatten();
    }

    /**
     * A metric's history against acquisition date with its baseline: the warning band shaded, the
     * centre, the action limits, a published limit, and the sessions that form the baseline filled.
     *
     * @param days    each session's acquisition time in days since the first
     * @param members which sessions are baseline members
     * @param origin  the date day 0 stands for, for the axis label
     */
    public static Plot trend(String label, double[] days, double[] values, boolean[] members, QaLog.Baseline b,
                             ActionLimits limits, String metric, String origin) {
        Plot plot = new Plot("Trend - " + label, "Days since " + origin, label);
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
        double ypad = hi > lo ? 0.08 * (hi - lo) : Math.max(1e-6, Math.abs(hi) * 0.05);
        double bottom = lo - ypad;
        plot.setLimits(ends[0], ends[1], bottom, hi + ypad);
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
        plot.setColor(new Color(20, 90, 170));
        plot.add("connected circle", days, values);
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
        plot.setColor(new Color(20, 90, 170), new Color(20, 90, 170));
        plot.add("filled circle", mx, my);
        plot.setColor(Color.black);
        plot.addLabel(0.01, 0.06, b.usable() ? String.format(java.util.Locale.ROOT, "baseline %d of %d sessions (filled): "
                + "green centre, shaded warning band, red action limits%s", b.sessions(), b.needed(),
                limit != null ? "; black: published limit" : "")
                : "baseline forming: " + b.sessions() + " of at least " + QaLog.MIN_COMPARE + " sessions");
        return plot;
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
