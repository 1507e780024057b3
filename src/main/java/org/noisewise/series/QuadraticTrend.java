package org.noisewise.series;

/**
 * Least-squares fit of a second-order polynomial in time to {@code n} equally spaced samples, in an
 * orthogonal basis so each coefficient is one projection: {@code p0 = 1}, {@code p1 = t - c},
 * {@code p2 = (t - c)^2 - q} with {@code c = (n - 1) / 2} and {@code q} the mean of {@code (t - c)^2}
 * (the three are mutually orthogonal over {@code t = 0 .. n - 1}). The residual variance divides by
 * {@code n - 3}, the degrees of freedom left after three fitted parameters, so it is unbiased for
 * white noise.
 */
public final class QuadraticTrend {

    private final int n;
    private final double[] p1;
    private final double[] p2;
    private final double norm1;
    private final double norm2;

    public QuadraticTrend(int n) {
        if (n < 4) {
            throw new IllegalArgumentException("a quadratic trend needs at least 4 samples, got " + n);
        }
        this.n = n;
        double c = (n - 1) / 2.0;
        double q = 0;
        for (int t = 0; t < n; t++) {
            q += (t - c) * (t - c);
        }
        q /= n;
        p1 = new double[n];
        p2 = new double[n];
        double a = 0;
        double b = 0;
        for (int t = 0; t < n; t++) {
            p1[t] = t - c;
            p2[t] = (t - c) * (t - c) - q;
            a += p1[t] * p1[t];
            b += p2[t] * p2[t];
        }
        norm1 = a;
        norm2 = b;
    }

    public int samples() {
        return n;
    }

    /** The linear basis value at sample {@code t}. */
    public double p1(int t) {
        return p1[t];
    }

    /** The quadratic basis value at sample {@code t}. */
    public double p2(int t) {
        return p2[t];
    }

    public double norm1() {
        return norm1;
    }

    public double norm2() {
        return norm2;
    }

    /** The fit of {@code y}: {mean, linear coefficient, quadratic coefficient}. */
    public double[] fit(double[] y) {
        double s0 = 0;
        double s1 = 0;
        double s2 = 0;
        for (int t = 0; t < n; t++) {
            s0 += y[t];
            s1 += y[t] * p1[t];
            s2 += y[t] * p2[t];
        }
        return new double[] {s0 / n, s1 / norm1, s2 / norm2};
    }

    /** The fitted values of a fit. */
    public double[] fitted(double[] coefficients) {
        double[] f = new double[n];
        for (int t = 0; t < n; t++) {
            f[t] = coefficients[0] + coefficients[1] * p1[t] + coefficients[2] * p2[t];
        }
        return f;
    }

    /** {@code y} minus its fit. */
    public double[] residuals(double[] y) {
        double[] f = fitted(fit(y));
        double[] r = new double[n];
        for (int t = 0; t < n; t++) {
            r[t] = y[t] - f[t];
        }
        return r;
    }

    /** The residual SD, {@code sqrt(sum r^2 / (n - 3))}. */
    public double residualSd(double[] y) {
        double ss = 0;
        for (double r : residuals(y)) {
            ss += r * r;
        }
        return Math.sqrt(ss / (n - 3));
    }
}
