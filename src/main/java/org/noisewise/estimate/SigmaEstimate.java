package org.noisewise.estimate;

/** One estimate of the per-channel noise SD with its 95% confidence interval and pixel count. */
public record SigmaEstimate(SigmaEstimator estimator, double sigma, Interval ci95, int pixels) {
}
