package org.noisewise.estimate;

import java.util.List;

/**
 * The result of the difference method on one plane.
 *
 * @param signal          statistics of image 1 over the region
 * @param averageMean     mean of the average image (I1 + I2)/2 over the region
 * @param meanDifference  mean of I1 - I2 over the region
 * @param sigmaMagnitude  the magnitude SD {@code SD(I1 - I2) / sqrt(2)}, uncorrected
 * @param magnitudeSnr    NEMA's plain figure {@code mean(I1) / sigmaMagnitude}
 * @param magnitudeSnrCi95 its interval
 * @param figures         corrected amplitude, sigma and SNR (Koay-Basser), with intervals
 * @param correlation     noise correlation of the difference image over the region
 * @param effectivePixels effective pixel count behind the sigma interval
 * @param channels        receive channels of the magnitude model
 * @param warnings        cautions
 */
public record DifferenceSnrResult(SampleStats signal, double averageMean, double meanDifference, double sigmaMagnitude,
                                  double magnitudeSnr, Interval magnitudeSnrCi95, CorrectedSnr figures,
                                  SpatialCorrelation.Result correlation, double effectivePixels, int channels,
                                  List<Warning> warnings) {
    public DifferenceSnrResult {
        warnings = List.copyOf(warnings);
    }

    /** Standard error of the average image's region mean, {@code s / sqrt(2 n_eff)} (n_eff for means). */
    public double averageStandardError() {
        return sigmaMagnitude * Math.sqrt(1.0 / (2.0 * correlation.effectiveForMean(signal.n())));
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
