package org.noisewise.phantom;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.Warning;

/**
 * Places the QA regions around a found phantom.
 *
 * <ul>
 *   <li>Signal: the phantom's own shape (ellipse or rectangle) about its centroid, scaled so that it
 *       holds the chosen fraction of the phantom's pixels (default 75%, NEMA MS 1).</li>
 *   <li>Side regions above, below, left and right of the phantom, in air, clear of the phantom and
 *       of the image border by a margin: used for percent-signal ghosting, and as background regions
 *       (only those along the readout direction when the phase-encoding direction is known).</li>
 *   <li>Uniformity: the square windows of about 1 cm^2 (from the pixel size; 1% of the signal area
 *       when the image has no calibration) with the highest and lowest mean inside the signal region.</li>
 * </ul>
 */
public final class QaRegions {

    /** Default signal-region fraction of the phantom area (NEMA MS 1: at least 75%). */
    public static final double DEFAULT_FRACTION = 0.75;

    private QaRegions() {
    }

    /** All placed regions and the cautions found while placing them. */
    public record Placement(PlacedRegion signal, List<PlacedRegion> background, PlacedRegion top, PlacedRegion bottom,
                            PlacedRegion left, PlacedRegion right, int windowW, int windowH, List<Warning> warnings) {
        public List<PlacedRegion> all() {
            List<PlacedRegion> out = new ArrayList<>();
            out.add(signal);
            for (PlacedRegion p : new PlacedRegion[] {top, bottom, left, right}) {
                if (p != null) {
                    out.add(p);
                }
            }
            return out;
        }
    }

    /**
     * @param pixelSizeMm pixel width and height in mm, or NaN when the image has no calibration
     */
    public static Placement place(Phantom p, int width, int height, double fraction, PhaseDirection phase,
                                  double pixelWidthMm, double pixelHeightMm) {
        if (!(fraction > 0 && fraction <= 1)) {
            throw new IllegalArgumentException("signal fraction must be in (0, 1], was " + fraction);
        }
        List<Warning> warnings = new ArrayList<>();
        PlacedRegion signal = signal(p, width, height, fraction);
        int margin = Math.max(2, (int) Math.round(0.03 * Math.min(width, height)));
        PlacedRegion top = side("ghost top", p.minX(), p.maxX(), margin, p.minY() - margin, width, true, p);
        PlacedRegion bottom = side("ghost bottom", p.minX(), p.maxX(), p.maxY() + 1 + margin, height - margin, width,
                true, p);
        PlacedRegion left = side("ghost left", p.minY(), p.maxY(), margin, p.minX() - margin, width, false, p);
        PlacedRegion right = side("ghost right", p.minY(), p.maxY(), p.maxX() + 1 + margin, width - margin, width,
                false, p);
        for (PlacedRegion r : new PlacedRegion[] {top, bottom, left, right}) {
            if (r == null) {
                warnings.add(new Warning("no_room", "not all four sides of the phantom have room for an air region "
                        + "clear of the phantom and the image border: ghosting cannot be measured; use a larger field of view"));
                break;
            }
        }
        List<PlacedRegion> bg = new ArrayList<>();
        // phase along rows: ghosts left/right, readout vertical, so air above and below is clean
        PlacedRegion[] readout = switch (phase) {
            case ROW -> new PlacedRegion[] {top, bottom};
            case COL -> new PlacedRegion[] {left, right};
            case UNKNOWN -> new PlacedRegion[] {top, bottom, left, right};
        };
        for (PlacedRegion r : readout) {
            if (r != null) {
                bg.add(new PlacedRegion(r.name().replace("ghost", "bg"), r.kind(), r.x(), r.y(), r.w(), r.h(),
                        new Region(r.name().replace("ghost", "bg"), r.region().indices())));
            }
        }
        int windowW;
        int windowH;
        if (Double.isFinite(pixelWidthMm) && Double.isFinite(pixelHeightMm) && pixelWidthMm > 0 && pixelHeightMm > 0) {
            // 10 mm x 10 mm, so non-square pixels give a window square in millimetres, not in pixels
            windowW = (int) Math.max(2, Math.round(10.0 / pixelWidthMm));
            windowH = (int) Math.max(2, Math.round(10.0 / pixelHeightMm));
        } else {
            windowW = fallbackWindow(signal.region().size());
            windowH = windowW;
            warnings.add(new Warning("uncalibrated", String.format(Locale.ROOT, "the image has no pixel size: the "
                    + "uniformity windows (1 cm^2 in published procedures) were set to %d x %d pixels, 1%% of the "
                    + "signal region; calibrate the image (Image > Properties) for the published size", windowW,
                    windowH)));
        }
        double offAxis = Math.min(Math.abs(p.tiltDegrees()), 90 - Math.abs(p.tiltDegrees()));
        if (offAxis > 3 && p.elongation() > 1.05) {
            warnings.add(new Warning("tilted_phantom", String.format(Locale.ROOT, "the phantom's long axis is tilted by "
                    + "%.0f degrees from the image axes: the regions are placed along the image axes, so the signal "
                    + "region holds the chosen fraction but not the phantom's own shape; straighten the phantom or "
                    + "adjust the regions by hand", p.tiltDegrees())));
        }
        return new Placement(signal, bg, top, bottom, left, right, windowW, windowH, warnings);
    }

    /**
     * The phantom's shape scaled about its centroid to hold {@code fraction} of its pixels: a phantom
     * pixel lies inside the shape scaled by {@code s} when its normalised distance {@code q} (squared,
     * {@code (dx/a)^2 + (dy/b)^2} for an ellipse, {@code max((dx/a)^2, (dy/b)^2)} for a rectangle) is at
     * most {@code s^2}, so the scale is the square root of the {@code k}-th smallest {@code q}, found by
     * a histogram pass and a sort of one bin (time linear in the pixels, no per-pixel array).
     */
    static PlacedRegion signal(Phantom p, int width, int height, double fraction) {
        int target = Math.max(1, (int) Math.round(fraction * p.area()));
        double[] limitAndCount = kthSmallestQ(p, width, target);
        double s = Math.sqrt(limitAndCount[0]);
        double a = s * p.semiX();
        double b = s * p.semiY();
        int[] idx = members(p, width, limitAndCount[0], (int) limitAndCount[1]);
        return new PlacedRegion("signal", p.rectangular() ? PlacedRegion.Kind.RECTANGLE : PlacedRegion.Kind.OVAL,
                p.cx() - a, p.cy() - b, 2 * a, 2 * b, new Region("signal", idx));
    }

    private static double q(Phantom p, int x, int y) {
        double dx = (x + 0.5 - p.cx()) / p.semiX();
        double dy = (y + 0.5 - p.cy()) / p.semiY();
        return p.rectangular() ? Math.max(dx * dx, dy * dy) : dx * dx + dy * dy;
    }

    /**
     * The {@code k}-th smallest {@code q} over the phantom's pixels (1-based {@code k}) and how many
     * pixels have {@code q} at most that value (ties included).
     */
    static double[] kthSmallestQ(Phantom p, int width, int k) {
        int bins = 1 << 16;
        // q is convex, so over the bounding box it is largest at a corner
        double qMax = 0;
        for (int y : new int[] {p.minY(), p.maxY()}) {
            for (int x : new int[] {p.minX(), p.maxX()}) {
                qMax = Math.max(qMax, q(p, x, y));
            }
        }
        int[] hist = new int[bins];
        double scale = bins / Math.nextUp(qMax);
        for (int y = p.minY(); y <= p.maxY(); y++) {
            for (int x = p.minX(); x <= p.maxX(); x++) {
                if (p.inside(y * width + x)) {
                    hist[Math.min(bins - 1, (int) (q(p, x, y) * scale))]++;
                }
            }
        }
        int bin = 0;
        int before = 0;
        while (bin < bins - 1 && before + hist[bin] < k) {
            before += hist[bin];
            bin++;
        }
        double[] inBin = new double[hist[bin]];
        int n = 0;
        for (int y = p.minY(); y <= p.maxY(); y++) {
            for (int x = p.minX(); x <= p.maxX(); x++) {
                if (p.inside(y * width + x)) {
                    double v = q(p, x, y);
                    if (Math.min(bins - 1, (int) (v * scale)) == bin) {
                        inBin[n++] = v;
                    }
                }
            }
        }
        java.util.Arrays.sort(inBin, 0, n);
        double limit = inBin[Math.max(0, Math.min(n - 1, k - before - 1))];
        int atMost = before;
        while (atMost - before < n && inBin[atMost - before] <= limit) {
            atMost++;
        }
        return new double[] {limit, atMost};
    }

    /** The {@code count} phantom pixels with {@code q <= limit}, in raster order. */
    private static int[] members(Phantom p, int width, double limit, int count) {
        int[] idx = new int[count];
        int n = 0;
        for (int y = p.minY(); y <= p.maxY(); y++) {
            for (int x = p.minX(); x <= p.maxX(); x++) {
                if (p.inside(y * width + x) && q(p, x, y) <= limit) {
                    idx[n++] = y * width + x;
                }
            }
        }
        return idx;
    }

    /**
     * A rectangle beside the phantom, reaching from {@code from} to {@code to} (exclusive) away from it
     * (along y for a horizontal band above or below, along x for one left or right), and spanning the
     * middle half of the phantom's extent across; {@code null} when there is no room or it would touch
     * the phantom.
     */
    private static PlacedRegion side(String name, int spanLo, int spanHi, int from, int to, int width, boolean horizontalBand,
                                     Phantom p) {
        int depth = to - from;
        int span = spanHi - spanLo + 1;
        int across = Math.max(3, span / 2);
        int start = spanLo + (span - across) / 2;
        if (depth < 3) {
            return null;
        }
        int x;
        int y;
        int w;
        int h;
        if (horizontalBand) {
            x = start;
            y = from;
            w = across;
            h = depth;
        } else {
            x = from;
            y = start;
            w = depth;
            h = across;
        }
        int[] idx = Region.rectangleIndices(x, y, w, h, width);
        for (int i : idx) {
            if (p.inside(i)) {
                return null;
            }
        }
        return new PlacedRegion(name, PlacedRegion.Kind.RECTANGLE, x, y, w, h, new Region(name, idx));
    }

    /** The side of the uniformity windows without a pixel size: 1% of the signal region's area, at least 2. */
    public static int fallbackWindow(int signalPixels) {
        return (int) Math.max(2, Math.round(Math.sqrt(0.01 * signalPixels)));
    }
}
