package org.noisewise.estimate;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.DoubleConsumer;
import java.util.stream.IntStream;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.special.Gamma;

/**
 * The repeated-acquisition (multiple-acquisition) method: {@code K >= 2} identical acquisitions of
 * one slice give, pixel by pixel, a temporal mean, a temporal SD (divisor {@code K - 1}) and their
 * ratio, an SNR map. It is the reference against which Dietrich et al. (2007, JMRI 26:375) judged
 * the other methods, and it stays valid with parallel imaging, filters and array coils because it
 * measures noise where it is, not in the background.
 *
 * <p>Region summary: {@code S} = region mean of the mean map, {@code sigma = sqrt(region mean of the
 * per-pixel variances)} (pooled, {@code n (K-1)} degrees of freedom, exact chi-square interval for
 * independent pixels). The mean of the SNR map over a region is not used: {@code 1/s} is biased
 * for small K, {@code E[1/s] = (1/sigma) b(K)} with
 * {@code b(K) = sqrt((K-1)/2) Gamma((K-2)/2) / Gamma((K-1)/2)} (the reciprocal chi mean), so the
 * mean SNR-map value is about {@code b(K)} times too high: 1.77 for K = 3, 1.05 for K = 16, and
 * infinite in expectation for K = 2.
 *
 * <p>The maps are computed in one pass over the frames per pixel (Welford's update), rows in
 * parallel on every core, with no per-pixel object allocation.
 */
public final class RepeatedAcquisitions {

    private RepeatedAcquisitions() {
    }

    /** Mean, SD and SNR maps of one slice. */
    public record Maps(int width, int height, int repeats, float[] mean, float[] sd, float[] snr) {
    }

    /**
     * Computes the maps.
     *
     * @param frames   K frames of {@code width * height} calibrated values
     * @param progress receives the fraction done (0..1), from any thread; may be {@code null}
     */
    public static Maps maps(float[][] frames, int width, int height, DoubleConsumer progress) throws InputException {
        int k = frames.length;
        if (k < 2) {
            throw new InputException("the repeated-acquisition method needs at least 2 repeats of the slice; got "
                    + k + ": choose a stack or a time series of repeated acquisitions");
        }
        int size = width * height;
        for (int f = 0; f < k; f++) {
            if (frames[f].length != size) {
                throw new InputException("repeat " + (f + 1) + " has " + frames[f].length + " pixels, not "
                        + size + ": every repeat must have the same matrix");
            }
        }
        float[] mean = new float[size];
        float[] sd = new float[size];
        float[] snr = new float[size];
        AtomicInteger rowsDone = new AtomicInteger();
        int step = Math.max(1, height / 50);
        IntStream.range(0, height).parallel().forEach(y -> {
            int start = y * width;
            for (int i = start; i < start + width; i++) {
                double m = 0;
                double m2 = 0;
                for (int f = 0; f < k; f++) {
                    double x = frames[f][i];
                    double delta = x - m;
                    m += delta / (f + 1);
                    m2 += delta * (x - m);
                }
                double s = Math.sqrt(m2 / (k - 1));
                mean[i] = (float) m;
                sd[i] = (float) s;
                snr[i] = s > 0 ? (float) (m / s) : Float.NaN;
            }
            int done = rowsDone.incrementAndGet();
            if (progress != null && done % step == 0) {
                progress.accept((double) done / height);
            }
        });
        if (progress != null) {
            progress.accept(1.0);
        }
        return new Maps(width, height, k, mean, sd, snr);
    }

    /** {@code b(K)}: how many times too high the mean of a per-pixel SNR map is, for K repeats. */
    public static double snrMapBias(int repeats) {
        if (repeats <= 2) {
            return Double.POSITIVE_INFINITY;
        }
        double nu = repeats - 1.0;
        return Math.sqrt(nu / 2.0) * Math.exp(Gamma.logGamma((nu - 1) / 2.0) - Gamma.logGamma(nu / 2.0));
    }

    /**
     * Region summary of the maps, optionally with Koay-Basser correction of the magnitude bias.
     *
     * @param rician   apply the correction (for low SNR)
     * @param channels receive channels L for the noise model
     */
    public static RepeatedSnrResult summarize(Maps maps, Region signal, boolean rician, int channels)
            throws InputException {
        if (signal == null) {
            throw new InputException("no signal region: mark the region to summarise");
        }
        double[] means = signal.values(maps.mean());
        double[] sds = signal.values(maps.sd());
        int n = means.length;
        SampleStats meanStats = SampleStats.of(means);
        double varSum = 0;
        for (double s : sds) {
            varSum += s * s;
        }
        double pooledVar = varSum / n;
        double sigma = Math.sqrt(pooledVar);
        if (!(sigma > 0)) {
            throw new InputException("the repeats are identical in region '" + signal.name()
                    + "': there is no noise to measure; check that the stack holds separate acquisitions");
        }
        double dof = n * (maps.repeats() - 1.0);
        ChiSquaredDistribution chi2 = new ChiSquaredDistribution(null, dof);
        Interval sigmaCi = new Interval(sigma * Math.sqrt(dof / chi2.inverseCumulativeProbability(0.975)),
                sigma * Math.sqrt(dof / chi2.inverseCumulativeProbability(0.025)));
        double signalMean = meanStats.mean();
        // the spread of the region mean: pixel-to-pixel variation of the temporal means
        double signalSe = n > 1 ? meanStats.standardError() : sigma / Math.sqrt(maps.repeats());
        double snr = signalMean / sigma;
        Interval snrCi = SnrMath.snrInterval(signalMean, signalSe, sigma, sigmaCi);
        double mapMean = 0;
        for (double v : signal.values(maps.snr())) {
            mapMean += v;
        }
        mapMean /= n;
        List<Warning> warnings = new ArrayList<>();
        KoayBasser.Correction corr = null;
        if (rician) {
            corr = KoayBasser.correct(signalMean, sigma, channels);
        } else if (snr < SnrMath.LOW_SNR_LIMIT && signalMean > 0) {
            KoayBasser.Correction c = KoayBasser.correct(signalMean, sigma, channels);
            warnings.add(new Warning("low_snr", String.format(Locale.ROOT,
                    "SNR %.2f is below %.0f: the magnitude mean is biased upward and the magnitude SD downward by "
                            + "noise; Koay-Basser correction gives signal %.4g and sigma %.4g (SNR %.2f). Use the Rician "
                            + "correction option.", snr, SnrMath.LOW_SNR_LIMIT, c.amplitude(), c.sigma(),
                    c.amplitude() / c.sigma())));
        }
        if (maps.repeats() < 8) {
            warnings.add(new Warning("few_repeats", String.format(Locale.ROOT,
                    "only %d repeats: each pixel's SD is rough and the SNR map's pixel values scatter widely "
                            + "(their mean is about %.2f times too high); rely on the region summary", maps.repeats(),
                    snrMapBias(maps.repeats()))));
        }
        return new RepeatedSnrResult(maps.repeats(), n, signalMean, sigma, sigmaCi, snr, snrCi, mapMean,
                snrMapBias(maps.repeats()), channels, corr, warnings);
    }
}
