package org.noisewise.series;

import java.util.List;
import org.noisewise.estimate.Interval;
import org.noisewise.estimate.Warning;

/**
 * The stability figures of one slice and region (see {@link Stability#summarize}).
 *
 * @param framesUsed       frames after the skipped ones
 * @param skipped          frames dropped at the start
 * @param roiSize          side of the square the Weisskoff curve uses
 * @param pixels           voxels in the region
 * @param signalMean       region mean of the signal (temporal mean) map
 * @param sfnr             SFNR, corrected for the bias of a mean of reciprocal SDs
 * @param sfnrCi95         its 95% interval
 * @param sfnrMapMean      the plain region mean of the SFNR map
 * @param snr              static-noise SNR
 * @param snrCi95          its 95% interval
 * @param staticSigma      the per-frame noise SD the static map implies, {@code sqrt(V / N_s)}
 * @param percentFluctuation 100 x residual SD / mean of the region-mean series
 * @param driftPercent     100 x (max - min of the fitted trend) / mean
 * @param driftCi95        its 95% interval (reaching 0 when no drift can be told from the fluctuation)
 * @param weisskoff        F(k) in percent for k = 1 .. roiSize
 * @param rdc              radius of decorrelation F(1) / F(roiSize)
 * @param series           the region-mean series (frames used)
 * @param fit              its second-order fit
 * @param frequency        residual spectrum frequencies (Hz, or cycles per frame when the frame interval is unknown)
 * @param power            residual spectrum power
 * @param repetitionSeconds frame interval in seconds, NaN when unknown
 */
public record StabilityResult(int framesUsed, int skipped, int roiSize, int pixels, double signalMean, double sfnr,
                              Interval sfnrCi95, double sfnrMapMean, double snr, Interval snrCi95, double staticSigma,
                              double percentFluctuation, double driftPercent, Interval driftCi95, double[] weisskoff,
                              double rdc,
                              double[] series, double[] fit, double[] frequency, double[] power,
                              double repetitionSeconds, List<Warning> warnings) {

    public StabilityResult {
        weisskoff = weisskoff.clone();
        series = series.clone();
        fit = fit.clone();
        frequency = frequency.clone();
        power = power.clone();
        warnings = List.copyOf(warnings);
    }

    @Override
    public double[] weisskoff() {
        return weisskoff.clone();
    }

    @Override
    public double[] series() {
        return series.clone();
    }

    @Override
    public double[] fit() {
        return fit.clone();
    }

    @Override
    public double[] frequency() {
        return frequency.clone();
    }

    @Override
    public double[] power() {
        return power.clone();
    }

    /** The ideal Weisskoff line {@code F(1) / k} (independent voxels) for k = 1 .. roiSize. */
    public double[] ideal() {
        double[] v = new double[weisskoff.length];
        for (int k = 0; k < v.length; k++) {
            v[k] = weisskoff[0] / (k + 1);
        }
        return v;
    }
}
