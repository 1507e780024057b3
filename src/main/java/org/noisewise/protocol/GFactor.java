package org.noisewise.protocol;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Interval;
import org.noisewise.estimate.Levels;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.Warning;
import org.apache.commons.math3.special.Gamma;

/**
 * The g-factor of parallel imaging, {@code g = SNR_full / (SNR_accelerated sqrt(R))} (Pruessmann et al.
 * 1999, MRM 42:952), per pixel from temporal mean and SD maps of repeated acquisitions and over a region
 * from the corrected SNRs of the two acquisitions.
 *
 * <p>The pixel map divides the two SNR maps; with K repeats a pixel's SD has {@code K - 1} degrees of
 * freedom, so the map is smoothed when asked: the variance maps are averaged over a {@code w x w} window
 * (edges clamped), worth {@code nu = (K - 1) w^2} degrees of freedom for uncorrelated noise. A pixel's
 * value holds the ratio of two sample SDs, {@code s_a / s_f}, whose square is {@code (sigma_a/sigma_f)^2}
 * times an F(nu_a, nu_f) variable: it is biased up by {@code E[s_a/s_f] / (sigma_a/sigma_f) =
 * c4(nu_a) e(nu_f)}, with {@code c4(nu) = sqrt(2/nu) Gamma((nu+1)/2) / Gamma(nu/2)} and
 * {@code e(nu) = E[sigma/s] = sqrt(nu/2) Gamma((nu-1)/2) / Gamma(nu/2)} (closed forms; about 6% at
 * K = 10), so the map is divided by that factor; its relative SD is then
 * {@code sqrt(E[F] / E[sqrt F]^2 - 1)} with {@code E[F] = nu_f / (nu_f - 2)} (exact for the SD ratio; the
 * means' own noise, small at the SNRs a map needs, is left out). Pixels of the full acquisition below
 * {@link #MIN_SNR} (air) are left out (NaN). The region value {@code g} divides the region's pooled SNRs,
 * whose noise is the root mean square over the region: it is the RMS of g over the region's pixels.
 */
public final class GFactor {

    /**
     * Pixels whose full-acquisition SNR (temporal mean over SD) is below this are left out of the map
     * (NaN): in air the ratio of two noise-only SNRs says nothing about the g-factor. Pure Rayleigh noise
     * has a mean/SD of 1.91, so 5 keeps noise out and any tissue or phantom signal in (our choice).
     */
    public static final double MIN_SNR = 5.0;

    /** The pixel-map precision (relative SD) below which no warning is given. */
    public static final double TARGET_PRECISION = 0.10;

    private GFactor() {
    }

    /** A region's g-factor. */
    public record Result(double g, Interval ci95, double gMax, double pixelMapMean, double acceleration,
                         double pixelPrecision, int repeatsNeeded, List<Warning> warnings) {
        public Result {
            warnings = List.copyOf(warnings);
        }
    }

    /**
     * The pixel map {@code (mean_f / sd_f) / ((mean_a / sd_a) sqrt(R))}, variances averaged over a
     * {@code window x window} square, divided by the small-sample bias of the SD ratio ({@link #ratioBias});
     * NaN where either SD is 0 or a mean is not positive.
     */
    public static float[] map(float[] meanFull, float[] sdFull, float[] meanAccel, float[] sdAccel, int width,
                              int height, double acceleration, int window, int repeatsFull, int repeatsAccel)
            throws InputException {
        int n = width * height;
        if (meanFull.length != n || sdFull.length != n || meanAccel.length != n || sdAccel.length != n) {
            throw new InputException("the two acquisitions differ in size: the g-factor compares the same slices at "
                    + "the same matrix");
        }
        if (window < 1 || window % 2 == 0) {
            throw new InputException("the smoothing window must be an odd whole number of pixels (1, 3, 5, ...), was "
                    + window);
        }
        float[] vf = boxMeanOfSquares(sdFull, width, height, window);
        float[] va = boxMeanOfSquares(sdAccel, width, height, window);
        float[] g = new float[n];
        double bias = ratioBias(degrees(repeatsAccel, window), degrees(repeatsFull, window));
        // one degree of freedom (a pair, no window): the ratio has no finite mean to correct; the precision warns
        double root = Math.sqrt(acceleration) * (Double.isFinite(bias) ? bias : 1.0);
        for (int i = 0; i < n; i++) {
            double snrF = meanFull[i] / Math.sqrt(vf[i]);
            double snrA = meanAccel[i] / Math.sqrt(va[i]);
            g[i] = meanFull[i] > 0 && meanAccel[i] > 0 && vf[i] > 0 && va[i] > 0 && snrF >= MIN_SNR
                    ? (float) (snrF / (snrA * root)) : Float.NaN;
        }
        return g;
    }

    /** The mean of {@code v^2} over a {@code w x w} square about each pixel (clamped at the edges). */
    static float[] boxMeanOfSquares(float[] v, int width, int height, int w) {
        int n = width * height;
        double[] sq = new double[n];
        for (int i = 0; i < n; i++) {
            sq[i] = (double) v[i] * v[i];
        }
        if (w == 1) {
            float[] out = new float[n];
            for (int i = 0; i < n; i++) {
                out[i] = (float) sq[i];
            }
            return out;
        }
        int r = w / 2;
        double[] rows = new double[n];
        for (int y = 0; y < height; y++) {
            for (int x = 0; x < width; x++) {
                double s = 0;
                int c = 0;
                for (int k = Math.max(0, x - r); k <= Math.min(width - 1, x + r); k++) {
                    s += sq[y * width + k];
                    c++;
                }
                rows[y * width + x] = s / c;
            }
        }
        float[] out = new float[n];
        for (int y = 0; y < height; y++) {
            for (int x = 0; x < width; x++) {
                double s = 0;
                int c = 0;
                for (int k = Math.max(0, y - r); k <= Math.min(height - 1, y + r); k++) {
                    s += rows[k * width + x];
                    c++;
                }
                out[y * width + x] = (float) (s / c);
            }
        }
        return out;
    }

    /** Degrees of freedom of a pixel's variance: {@code (K - 1) w^2}. */
    static double degrees(int repeats, int window) {
        return (repeats - 1.0) * window * window;
    }

    /** {@code c4(nu) = E[s] / sigma} for a sample SD with {@code nu} degrees of freedom (closed form). */
    static double c4(double nu) {
        return Math.sqrt(2 / nu) * Math.exp(Gamma.logGamma((nu + 1) / 2) - Gamma.logGamma(nu / 2));
    }

    /** {@code E[sigma / s]} for {@code nu > 1} degrees of freedom (closed form); infinite at or below 1. */
    static double inverseSd(double nu) {
        return nu > 1 ? Math.sqrt(nu / 2) * Math.exp(Gamma.logGamma((nu - 1) / 2) - Gamma.logGamma(nu / 2))
                : Double.POSITIVE_INFINITY;
    }

    /** The bias of {@code s_a / s_f}: {@code c4(nu_a) E[sigma_f / s_f]}. */
    public static double ratioBias(double nuAccel, double nuFull) {
        return c4(nuAccel) * inverseSd(nuFull);
    }

    /**
     * Relative SD of one bias-corrected pixel of the map: the SD ratio's {@code sqrt(E[F] / E[sqrt F]^2 - 1)},
     * {@code E[F] = nu_f / (nu_f - 2)}; infinite when {@code nu_f <= 2}.
     */
    public static double pixelPrecision(int repeatsFull, int repeatsAccel, int window) {
        double nf = degrees(repeatsFull, window);
        double na = degrees(repeatsAccel, window);
        if (nf <= 2) {
            return Double.POSITIVE_INFINITY;
        }
        double b = ratioBias(na, nf);
        return Math.sqrt(nf / (nf - 2) / (b * b) - 1);
    }

    /** Repeats of each acquisition that give the pixel map {@link #TARGET_PRECISION} at this window. */
    public static int repeatsNeeded(int window) {
        int k = 2;
        while (k < 1_000_000 && pixelPrecision(k, k, window) > TARGET_PRECISION) {
            k = k < 1000 ? k + 1 : (int) (k * 1.05);
        }
        return k;
    }

    /**
     * The region's g-factor from the corrected SNRs of the full and the accelerated acquisition; the
     * interval is log-normal with the SNRs' log standard errors added in quadrature. {@code gMax} and
     * {@code pixelMapMean} come from the pixel map over the region.
     */
    public static Result region(CorrectedSnr full, CorrectedSnr accel, double acceleration, float[] map, Region region,
                                int repeatsFull, int repeatsAccel, int window) throws InputException {
        if (!(acceleration >= 1) || !Double.isFinite(acceleration)) {
            throw new InputException("the acceleration factor R must be 1 or more, was " + acceleration);
        }
        if (!(full.snr() > 0) || !(accel.snr() > 0)) {
            throw new InputException("the " + (full.snr() > 0 ? "accelerated" : "full") + " acquisition has no "
                    + "measurable signal in region '" + region.name() + "' (SNR 0): place the region on the object");
        }
        double g = full.snr() / (accel.snr() * Math.sqrt(acceleration));
        double se = Math.hypot(CorrectedSnr.logSe(full.snrCi95()), CorrectedSnr.logSe(accel.snrCi95()));
        Interval ci = Double.isFinite(se) ? new Interval(g * Math.exp(-Levels.Z95 * se), g * Math.exp(Levels.Z95 * se))
                : new Interval(Double.NaN, Double.NaN);
        double max = Double.NaN;
        double sum = 0;
        int count = 0;
        for (int i : region.indices()) {
            float v = map[i];
            if (Float.isFinite(v)) {
                max = Double.isNaN(max) ? v : Math.max(max, v);
                sum += v;
                count++;
            }
        }
        double precision = pixelPrecision(repeatsFull, repeatsAccel, window);
        int needed = repeatsNeeded(window);
        List<Warning> w = new ArrayList<>();
        if (precision > TARGET_PRECISION) {
            w.add(new Warning("few_repeats", String.format(Locale.ROOT, "the pixel map is noisy: with %d and %d "
                    + "repeats and a %dx%d window each pixel's g is uncertain by about %.0f%% (1 SD), so g_max is "
                    + "biased upward; %d repeats of each acquisition (or a wider map window) give %.0f%%; the region "
                    + "value g_mean pools every pixel and is not affected", repeatsFull, repeatsAccel, window, window,
                    100 * precision, needed, 100 * TARGET_PRECISION)));
        }
        if (g < 1 && ci.high() < 1) {
            w.add(new Warning("g_below_one", "g is below 1 beyond its interval: the two acquisitions differ in more "
                    + "than acceleration (reconstruction filter, scaling, coil), or R is wrong"));
        }
        return new Result(g, ci, max, count > 0 ? sum / count : Double.NaN, acceleration, precision, needed, w);
    }
}
