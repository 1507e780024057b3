package org.noisewise.estimate;

/**
 * Count, mean and sample SD (divisor {@code n - 1}) of a region, plus the sum of squares and the
 * fourth central moment used by the interval methods. Sums are accumulated in compensated
 * (Kahan) form so that large uniform regions keep full precision.
 */
public record SampleStats(int n, double mean, double sd, double sumSquares, double fourthCentralMoment) {

    public static SampleStats of(double[] v) {
        int n = v.length;
        if (n == 0) {
            throw new IllegalArgumentException("no values");
        }
        double mean = kahanSum(v) / n;
        double m2 = 0;
        double m4 = 0;
        double sq = 0;
        for (double x : v) {
            double d = x - mean;
            double d2 = d * d;
            m2 += d2;
            m4 += d2 * d2;
            sq += x * x;
        }
        double sd = n > 1 ? Math.sqrt(m2 / (n - 1)) : Double.NaN;
        return new SampleStats(n, mean, sd, sq, m4 / n);
    }

    private static double kahanSum(double[] v) {
        double sum = 0;
        double c = 0;
        for (double x : v) {
            double y = x - c;
            double t = sum + y;
            c = (t - sum) - y;
            sum = t;
        }
        return sum;
    }

    /** Standard error of the mean, {@code sd / sqrt(n)}. */
    public double standardError() {
        return sd / Math.sqrt(n);
    }

    /**
     * An SD with the variance of rounding to whole multiples of {@code step} removed (Sheppard's
     * correction, {@code s^2 - step^2 / 12}); unchanged for continuous values ({@code step = 0}) or
     * where the rounding is as coarse as the noise ({@code s^2 <= step^2 / 6}), where the correction
     * no longer holds.
     */
    public static double sheppard(double sd, double step) {
        double r = step * step / 12.0;
        return step > 0 && sd * sd > 2 * r ? Math.sqrt(sd * sd - r) : sd;
    }
}
