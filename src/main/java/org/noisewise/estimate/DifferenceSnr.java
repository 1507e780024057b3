package org.noisewise.estimate;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The two-acquisition (NEMA MS 1 difference) method: two identical acquisitions close in time.
 * Over the signal region, the magnitude SD is {@code s = SD(I1 - I2) / sqrt(2)} and NEMA's figure is
 * {@code mean(I1) / s = sqrt(2) S / SD(diff)}. Structure, coil profiles, ghosts that repeat, masking and
 * filtering of the background do not enter, which is why it stays valid where background methods
 * fail (Dietrich et al. 2007, JMRI 26:375).
 *
 * <p>At low SNR the magnitude mean is above the amplitude and the magnitude SD below sigma, so the
 * reported figures are Koay and Basser's correction ({@link CorrectedSnr#meanAndSd}) of the average
 * image's mean and of {@code s}; NEMA's plain ratio is kept beside them. Spatially correlated noise is
 * measured on the difference image itself: the squared-correlation sum sets the degrees of freedom of
 * {@code s} (whose interval treats the difference as Gaussian, as a difference of two magnitudes nearly
 * is), the linear sum the standard errors of the means and the divisor {@code n - V1} that keeps
 * {@code s^2} unbiased for correlated pixels ({@link SpatialCorrelation}).
 */
public final class DifferenceSnr {

    /** Fewer signal pixels than this gives an imprecise estimate (common practice). */
    public static final int MIN_PIXELS = 100;
    /** Mean difference beyond this many standard errors suggests drift or misregistration. */
    public static final double DRIFT_Z = 3.0;

    private DifferenceSnr() {
    }

    /**
     * @param first    image 1, calibrated values
     * @param second   image 2, same size
     * @param width    plane width, for the spatial correlation of the difference image
     * @param signal   the signal region
     * @param channels receive channels L of the magnitude model
     */
    public static DifferenceSnrResult analyze(float[] first, float[] second, int width, Region signal, int channels)
            throws InputException {
        return analyze(first, second, width, signal, channels, 0.0);
    }

    /**
     * As {@link #analyze(float[], float[], int, Region, int)} for values stored as whole multiples of
     * {@code step} (0: continuous): rounding adds {@code step^2 / 12} to the variance of each image
     * (Sheppard's correction), which the corrected sigma removes; the plain figures keep it, as a hand
     * calculation would.
     */
    public static DifferenceSnrResult analyze(float[] first, float[] second, int width, Region signal, int channels,
                                              double step) throws InputException {
        if (first.length != second.length) {
            throw new InputException("the two acquisitions differ in size (" + first.length + " and "
                    + second.length + " pixels): choose two images of the same matrix");
        }
        if (signal == null) {
            throw new InputException("no signal region: mark the region to measure");
        }
        double[] a = signal.values(first);
        double[] b = signal.values(second);
        int n = a.length;
        if (n < 2) {
            throw new InputException("region '" + signal.name() + "' holds one pixel: the difference method needs the "
                    + "spread of many pixels; draw a region of at least " + MIN_PIXELS + " pixels");
        }
        double[] d = new double[n];
        double[] avg = new double[n];
        for (int i = 0; i < n; i++) {
            d[i] = a[i] - b[i];
            avg[i] = 0.5 * (a[i] + b[i]);
        }
        SampleStats sa = SampleStats.of(a);
        SampleStats sd = SampleStats.of(d);
        SampleStats savg = SampleStats.of(avg);
        if (sd.sd() == 0) {
            throw new InputException("the two acquisitions are identical in region '" + signal.name()
                    + "': choose two separate acquisitions, not the same image twice");
        }
        SpatialCorrelation.Result corr = correlation(first, second, width, signal, sd.mean());
        double nVar = corr.effectiveForVariance(n);
        double nMean = corr.effectiveForMean(n);
        // E[sum (d - mean)^2] = var (n - V1) for correlated pixels (n - 1 when independent)
        double s = sd.sd() * Math.sqrt((n - 1.0) / Math.max(1.0, n - corr.linear())) / Math.sqrt(2.0);
        // the difference of two magnitudes is close to Gaussian: Var(s^2) = 2 s^4 V2 / n
        double seLogS = Math.sqrt(0.5 / nVar);
        double seAverage = s * Math.sqrt(1.0 / (2.0 * nMean));
        int negatives = SignedValues.negatives(a) + SignedValues.negatives(b);
        boolean signed = SignedValues.signed(negatives, 2L * n);
        double noise = SampleStats.sheppard(s, step);
        CorrectedSnr figures = signed ? CorrectedSnr.gaussian(savg.mean(), seAverage, noise, seLogS)
                : CorrectedSnr.meanAndSd(savg.mean(), seAverage, noise, seLogS, channels);
        double plain = sa.mean() / s;
        double seLogPlain = Math.sqrt(Math.pow(s / Math.sqrt(nMean) / sa.mean(), 2) + seLogS * seLogS);
        Interval plainCi = sa.mean() > 0 ? new Interval(plain * Math.exp(-Levels.Z95 * seLogPlain),
                plain * Math.exp(Levels.Z95 * seLogPlain)) : new Interval(Double.NaN, Double.NaN);
        List<Warning> warnings = new ArrayList<>();
        if (signed) {
            plainCi = figures.snrCi95();
            warnings.add(SignedValues.gaussianWarning(signal.name(), negatives, 2L * n));
        }
        double z = sd.mean() / (sd.sd() / Math.sqrt(nMean));
        if (corr.correlated() && Math.max(corr.neighbourX(), corr.neighbourY()) > 0.1) {
            warnings.add(new Warning("correlated_noise", String.format(Locale.ROOT,
                    "neighbouring pixels' noise correlates (%.2f along x, %.2f along y in the difference image): "
                            + "interpolation, zero-filling or filtering; intervals use an effective pixel count of "
                            + "%.0f of %d", corr.neighbourX(), corr.neighbourY(), nVar, n)));
        }
        if (Math.abs(z) > DRIFT_Z) {
            warnings.add(new Warning("drift", String.format(Locale.ROOT,
                    "the mean difference between the acquisitions is %.3g (%.1f standard errors, %.2f%% of the "
                            + "signal): signal drift, motion or misregistration between them inflates sigma; "
                            + "check the scanner's stability and that nothing moved", sd.mean(), z,
                    100 * sd.mean() / sa.mean())));
        }
        if (n < MIN_PIXELS) {
            warnings.add(new Warning("few_pixels", String.format(Locale.ROOT,
                    "only %d pixels in the region (fewer than %d): sigma is imprecise; draw a larger region",
                    n, MIN_PIXELS)));
        }
        warnings.addAll(figures.warnings());
        return new DifferenceSnrResult(sa, savg.mean(), sd.mean(), s, plain, plainCi, figures, corr, nVar, channels,
                warnings);
    }

    /** The correlation of the difference image over the region, about its mean. */
    static SpatialCorrelation.Result correlation(float[] first, float[] second, int width, Region signal, double mean) {
        SpatialCorrelation.Patch p = SpatialCorrelation.Patch.of(signal, width);
        double[] qa = p.sample(first, width);
        double[] qb = p.sample(second, width);
        for (int i = 0; i < qa.length; i++) {
            qa[i] -= qb[i];
        }
        SpatialCorrelation.LagSums sums = new SpatialCorrelation.LagSums(SpatialCorrelation.SQUARE_WINDOW);
        sums.add(p, qa, mean);
        return sums.result(p.n());
    }
}
