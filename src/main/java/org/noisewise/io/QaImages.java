package org.noisewise.io;

import ij.ImagePlus;
import ij.gui.OvalRoi;
import ij.gui.Overlay;
import ij.gui.Plot;
import ij.gui.Roi;
import ij.gui.TextRoi;
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

    /** An ImageJ ROI for a placed region, named and coloured by its role. */
    public static Roi roi(PlacedRegion p) {
        Roi r = p.kind() == PlacedRegion.Kind.OVAL ? new OvalRoi(p.x(), p.y(), p.w(), p.h())
                : new Roi(p.x(), p.y(), p.w(), p.h());
        r.setName(p.name());
        r.setStrokeColor(colour(p.name()));
        return r;
    }

    private static Color colour(String name) {
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

    /** The slice, enlarged for legibility, with every region drawn and labelled. */
    public static ImagePlus sliceWithRegions(String title, float[] pixels, int width, int height, List<PlacedRegion> regions) {
        int zoom = Math.max(1, (int) Math.ceil(384.0 / Math.max(width, height)));
        ImageProcessor ip = new FloatProcessor(width, height, pixels.clone());
        ip.setInterpolationMethod(ImageProcessor.NONE);
        ip = ip.resize(width * zoom, height * zoom);
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
            PlacedRegion z = new PlacedRegion(p.name(), p.kind(), p.x() * zoom, p.y() * zoom, p.w() * zoom, p.h() * zoom,
                    null);
            Roi r = roi(z);
            r.setStrokeWidth(1.5);
            ov.add(r);
            TextRoi label = new TextRoi(z.x() + 2, z.y() + 1, p.name(), font);
            label.setStrokeColor(colour(p.name()));
            ov.add(label);
        }
        imp.setOverlay(ov);
        return imp.flatten();
    }

    /** A metric's history with its baseline band (mean, +/- 2 SD, +/- 3 SD) and a published limit. */
    public static Plot trend(String label, double[] values, QaLog.Baseline b, ActionLimits limits, String metric) {
        double[] x = new double[values.length];
        for (int i = 0; i < x.length; i++) {
            x[i] = i + 1;
        }
        Plot plot = new Plot("Trend - " + label, "Session", label);
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double v : values) {
            if (Double.isFinite(v)) {
                lo = Math.min(lo, v);
                hi = Math.max(hi, v);
            }
        }
        double[] ends = {0.5, values.length + 0.5};
        if (b.complete() && b.sd() > 0) {
            plot.setColor(new Color(120, 170, 120));
            plot.addPoints(ends, new double[] {b.mean(), b.mean()}, Plot.LINE);
            plot.setColor(new Color(230, 170, 40));
            for (int k : new int[] {-2, 2}) {
                plot.addPoints(ends, new double[] {b.mean() + k * b.sd(), b.mean() + k * b.sd()}, Plot.LINE);
            }
            plot.setColor(new Color(200, 40, 40));
            for (int k : new int[] {-3, 3}) {
                plot.addPoints(ends, new double[] {b.mean() + k * b.sd(), b.mean() + k * b.sd()}, Plot.LINE);
            }
            lo = Math.min(lo, b.mean() - 3.3 * b.sd());
            hi = Math.max(hi, b.mean() + 3.3 * b.sd());
        }
        Double limit = limits == null ? null : metric.equals("uniformity_piu") ? Double.valueOf(limits.minimumPiu())
                : metric.equals("ghosting_percent") ? Double.valueOf(limits.maximumGhostingPercent()) : null;
        if (limit != null) {
            plot.setColor(Color.black);
            plot.setLineWidth(2);
            plot.addPoints(ends, new double[] {limit, limit}, Plot.LINE);
            plot.setLineWidth(1);
            lo = Math.min(lo, limit);
            hi = Math.max(hi, limit);
        }
        plot.setColor(new Color(20, 90, 170));
        plot.addPoints(x, values, Plot.CONNECTED_CIRCLES);
        double pad = hi > lo ? 0.08 * (hi - lo) : Math.max(1e-6, Math.abs(hi) * 0.05);
        plot.setLimits(0.5, values.length + 0.5, lo - pad, hi + pad);
        plot.setColor(Color.black);
        plot.addLabel(0.01, 0.06, b.complete() ? "baseline: first " + b.needed() + " sessions; green mean, amber +/-2 SD, "
                + "red +/-3 SD" + (limit != null ? "; black: published limit" : "")
                : "baseline forming: " + b.sessions() + " of " + b.needed() + " sessions");
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
