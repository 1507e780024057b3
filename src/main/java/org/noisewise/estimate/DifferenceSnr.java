package org.noisewise.estimate;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.noisewise.diagnose.NoiseCorrelation;

/**
 * The two-acquisition (NEMA MS 1 difference) method: two identical acquisitions close in time,
 * {@code sigma = SD(I1 - I2) / sqrt(2)} over the signal region, {@code S} = mean of image 1 over the
 * same region, {@code SNR = S / sigma = sqrt(2) S / SD(diff)}. Structure, coil profiles, ghosts that
 * repeat, masking and filtering of the background do not enter, which is why it stays valid where
 * background methods fail (Dietrich et al. 2007, JMRI 26:375).
 *
 * <p>The sigma interval treats the difference as Gaussian: {@code (n-1) s^2 / var ~ chi^2(n-1)}, with
 * {@code n} the effective pixel count when the difference image shows spatially correlated noise.
 * At low SNR the magnitude SD is below sigma (Rice), so the method then underestimates sigma and a
 * warning says so.
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
     * @param channels receive channels (only for the low-SNR bias statement)
     */
    public static DifferenceSnrResult analyze(float[] first, float[] second, int width, Region signal, int channels)
            throws InputException {
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
            throw new InputException("region '" + signal.name() + "' holds one pixel: draw a larger region");
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
        List<Warning> warnings = new ArrayList<>();
        if (sd.sd() == 0) {
            throw new InputException("the two acquisitions are identical in region '" + signal.name()
                    + "': choose two separate acquisitions, not the same image twice");
        }
        // Correlated noise (interpolation, zero-filling, filtering) is measured on the difference image:
        // its squares set the degrees of freedom of the variance, its values the standard errors of means.
        float[] diff = new float[first.length];
        for (int i = 0; i < diff.length; i++) {
            diff[i] = first[i] - second[i];
        }
        NoiseCorrelation.Result values = NoiseCorrelation.ofValues(diff, width, List.of(signal));
        double nVar = Math.max(2.0, NoiseCorrelation.ofSquares(diff, width, List.of(signal)).effective(n));
        double nMean = Math.max(2.0, values.effective(n));
        double sigma = sd.sd() / Math.sqrt(2.0);
        ChiSquaredDistribution chi2 = new ChiSquaredDistribution(null, nVar - 1.0);
        Interval ci = new Interval(sigma * Math.sqrt((nVar - 1.0) / chi2.inverseCumulativeProbability(0.975)),
                sigma * Math.sqrt((nVar - 1.0) / chi2.inverseCumulativeProbability(0.025)));
        double snr = sa.mean() / sigma;
        Interval snrCi = SnrMath.snrInterval(sa.mean(), sa.sd() / Math.sqrt(nMean), sigma, ci);
        double z = sd.mean() / (sd.sd() / Math.sqrt(nMean));
        if (values.worthWarning()) {
            warnings.add(new Warning("correlated_noise", String.format(Locale.ROOT,
                    "neighbouring pixels' noise correlates (%.2f along x, %.2f along y in the difference image): "
                            + "interpolation, zero-filling or filtering; intervals use an effective pixel count of "
                            + "%.0f of %d", values.neighbourX(), values.neighbourY(), nVar, n)));
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
        Warning low = SnrMath.lowSnrWarning(snr, channels);
        if (low != null) {
            warnings.add(new Warning("low_snr", low.message()
                    + " The difference of two magnitude images also underestimates sigma at this SNR."));
        }
        return new DifferenceSnrResult(sa, savg.mean(), sd.mean(), sigma, ci, snr, snrCi, channels, values.neighbourX(),
                values.neighbourY(), nVar, warnings);
    }
}
