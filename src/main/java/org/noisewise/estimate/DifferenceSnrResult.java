package org.noisewise.estimate;

import java.util.List;

/**
 * The result of the difference method on one plane.
 *
 * @param signal         statistics of image 1 over the region
 * @param averageMean    mean of the average image (I1 + I2)/2 over the region
 * @param meanDifference mean of I1 - I2 over the region
 * @param sigma          SD(I1 - I2) / sqrt(2)
 * @param sigmaCi95      chi-square interval of sigma
 * @param snr            signal mean / sigma
 * @param snrCi95        interval of the SNR
 * @param channels       receive channels assumed for the low-SNR statement
 * @param correlationX   noise correlation of horizontal neighbours in the difference image
 * @param correlationY   noise correlation of vertical neighbours
 * @param effectivePixels effective pixel count behind the sigma interval
 * @param warnings       cautions
 */
public record DifferenceSnrResult(SampleStats signal, double averageMean, double meanDifference, double sigma,
                                  Interval sigmaCi95, double snr, Interval snrCi95, int channels,
                                  double correlationX, double correlationY, double effectivePixels,
                                  List<Warning> warnings) {
    public DifferenceSnrResult {
        warnings = List.copyOf(warnings);
    }
}
