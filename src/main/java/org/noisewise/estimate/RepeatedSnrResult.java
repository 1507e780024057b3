package org.noisewise.estimate;

import java.util.List;

/**
 * Region summary of the repeated-acquisition maps.
 *
 * @param repeats     K
 * @param pixels      pixels in the region
 * @param signalMean  region mean of the mean map
 * @param sigma       sqrt(region mean of per-pixel variances)
 * @param sigmaCi95   chi-square interval, n (K - 1) degrees of freedom
 * @param snr         signalMean / sigma
 * @param snrCi95     interval of the SNR
 * @param snrMapMean  the region mean of the SNR map (biased; shown for comparison)
 * @param snrMapBias  expected ratio of snrMapMean to the true SNR, b(K)
 * @param channels    receive channels L
 * @param rician      Koay-Basser correction, or {@code null} when not asked for
 * @param warnings    cautions
 */
public record RepeatedSnrResult(int repeats, int pixels, double signalMean, double sigma, Interval sigmaCi95,
                                double snr, Interval snrCi95, double snrMapMean, double snrMapBias, int channels,
                                KoayBasser.Correction rician, List<Warning> warnings) {
    public RepeatedSnrResult {
        warnings = List.copyOf(warnings);
    }

    /** The corrected SNR A/sigma, or NaN without correction. */
    public double correctedSnr() {
        return rician == null ? Double.NaN : rician.amplitude() / rician.sigma();
    }
}
