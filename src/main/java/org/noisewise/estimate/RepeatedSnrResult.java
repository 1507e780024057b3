package org.noisewise.estimate;

import java.util.List;

/**
 * Region summary of the repeated-acquisition maps.
 *
 * @param repeats          K
 * @param pixels           pixels in the region
 * @param signalMean       region mean of the mean map (magnitude, uncorrected)
 * @param sigmaMagnitude   sqrt(region mean of per-pixel variances), uncorrected
 * @param magnitudeSnr     signalMean / sigmaMagnitude, the plain ratio
 * @param magnitudeSnrCi95 its interval
 * @param figures          corrected amplitude, sigma and SNR (Koay-Basser), with intervals
 * @param snrMapMean       the region mean of the SNR map (biased; shown for comparison)
 * @param snrMapBias       expected ratio of snrMapMean to the true SNR, b(K)
 * @param correlation      spatial correlation of the temporal residuals over the region
 * @param channels         receive channels L
 * @param warnings         cautions
 */
public record RepeatedSnrResult(int repeats, int pixels, double signalMean, double sigmaMagnitude,
                                double magnitudeSnr, Interval magnitudeSnrCi95, CorrectedSnr figures,
                                double snrMapMean, double snrMapBias, SpatialCorrelation.Result correlation,
                                int channels, List<Warning> warnings) {
    public RepeatedSnrResult {
        warnings = List.copyOf(warnings);
    }

    /** Standard error of the region's magnitude mean, {@code s sqrt(V1 / (n K))} with the residuals' linear inflation. */
    public double meanStandardError() {
        return sigmaMagnitude * Math.sqrt(correlation.linear() / ((double) pixels * repeats));
    }

    /** The corrected per-channel noise SD. */
    public double sigma() {
        return figures.sigma();
    }

    public Interval sigmaCi95() {
        return figures.sigmaCi95();
    }

    /** The corrected SNR {@code A / sigma}. */
    public double snr() {
        return figures.snr();
    }

    public Interval snrCi95() {
        return figures.snrCi95();
    }
}
