package org.noisewise.series;

import java.util.SplittableRandom;
import org.noisewise.estimate.Interval;
import org.noisewise.estimate.OrderStatistics;

/**
 * The noise structure of a stability series that its intervals must carry: correlation in time, and the
 * drift figure's interval.
 *
 * <ul>
 * <li>Correlation in time: a residual series is modelled as AR(1) ({@link Ar1}), its coefficient chosen so
 * that the quadratic fit's residuals would show the observed lag-1 correlation. The exact traces of the
 * fit's residual projection with that correlation give the variance of a residual variance (for the SFNR
 * interval), the series variance behind a residual variance, and the variances of the fitted linear and
 * quadratic coefficients (for the drift). White residuals give the textbook {@code n - 3} degrees of
 * freedom. (Bayley and Hammersley 1946 and Bartlett 1946 for the effective sample sizes of means and
 * variances of autocorrelated series.)</li>
 * <li>Drift {@code D = 100 (max - min of the fitted trend a1 p1 + a2 p2) / mean}: a range is never
 * negative and is biased up by noise, so the interval is a Neyman construction along the fitted trend's
 * own shape: for a true trend {@code lambda (a1, a2)} (drift {@code lambda D_obs}) the drift a new series
 * would show is simulated from the coefficients' Gaussian errors, with common random numbers; the
 * interval holds every true drift whose 2.5-97.5% range contains the observed one, and starts at 0 when
 * the observed drift lies within the 95% of what a series with no drift shows.</li>
 * </ul>
 */
public final class SeriesNoise {

    /** Simulated series per candidate drift. */
    static final int DRAWS = 600;
    /**
     * Relative width at which a bisection stops: far below what the figures it feeds can resolve (the
     * drift's simulated quantiles scatter by about 1/sqrt(DRAWS), an AR(1) coefficient is known to about
     * 1/sqrt(n)), and below the digits any output shows.
     */
    static final double BISECTION_TOLERANCE = 1e-7;

    private SeriesNoise() {
    }

    /** The lag-k autocorrelation of a zero-mean series (the residuals of a fit). */
    static double autocorrelation(double[] r, int k) {
        double num = 0;
        double den = 0;
        for (int t = 0; t < r.length; t++) {
            den += r[t] * r[t];
            if (t + k < r.length) {
                num += r[t] * r[t + k];
            }
        }
        return den > 0 ? num / den : 0.0;
    }


    /** The drift of a fitted trend {@code a1 p1 + a2 p2} over the frames, in percent of {@code mean}. */
    static double drift(QuadraticTrend trend, double a1, double a2, double mean) {
        int n = trend.samples();
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        // a quadratic's extremes over the frames lie at the ends or at the frames beside its vertex
        int[] candidates = {0, n - 1, -1, -1};
        double c = (n - 1) / 2.0;
        if (a2 != 0) {
            double v = c - a1 / (2 * a2);
            candidates[2] = (int) Math.floor(v);
            candidates[3] = (int) Math.ceil(v);
        }
        for (int t : candidates) {
            if (t >= 0 && t < n) {
                double f = a1 * trend.p1(t) + a2 * trend.p2(t);
                lo = Math.min(lo, f);
                hi = Math.max(hi, f);
            }
        }
        return 100 * (hi - lo) / mean;
    }

    /**
     * The 95% interval of the drift (see the class description).
     *
     * @param a1   fitted linear coefficient
     * @param a2   fitted quadratic coefficient
     * @param mean the series mean the drift is a percentage of
     * @param s1   standard error of {@code a1}
     * @param s2   standard error of {@code a2}
     * @param seed for the simulated draws (the interval is the same for the same data)
     */
    static Interval driftInterval(QuadraticTrend trend, double a1, double a2, double mean, double s1, double s2,
                                  long seed) {
        double observed = drift(trend, a1, a2, mean);
        if (!(mean > 0) || !Double.isFinite(observed) || !(s1 > 0)) {
            return new Interval(Double.NaN, Double.NaN);
        }
        if (!(observed > 0)) {
            observed = Double.MIN_NORMAL;
        }
        SplittableRandom rng = new SplittableRandom(seed);
        double[] z1 = new double[DRAWS];
        double[] z2 = new double[DRAWS];
        for (int i = 0; i < DRAWS; i++) {
            z1[i] = s1 * rng.nextGaussian();
            z2[i] = s2 * rng.nextGaussian();
        }
        // quantiles of the simulated drift for a true trend lambda (a1, a2)
        java.util.function.DoubleFunction<double[]> quantiles = lambda -> {
            double[] d = new double[DRAWS];
            for (int i = 0; i < DRAWS; i++) {
                d[i] = drift(trend, lambda * a1 + z1[i], lambda * a2 + z2[i], mean);
            }
            // the three order statistics a sort would give, found by selection (k95 < k975, k025 below both)
            int k025 = (int) Math.floor(0.025 * (DRAWS - 1));
            int k975 = (int) Math.ceil(0.975 * (DRAWS - 1));
            int k95 = (int) Math.ceil(0.95 * (DRAWS - 1));
            double q95 = OrderStatistics.selectInPlace(d, 0, DRAWS - 1, k95);
            double q975 = OrderStatistics.selectInPlace(d, k95 + 1, DRAWS - 1, k975);
            double q025 = OrderStatistics.selectInPlace(d, 0, k95 - 1, k025);
            return new double[] {q025, q975, q95};
        };
        // the scale of one standard error of the drift, for the search brackets
        double se = Math.max(drift(trend, s1, 0, mean), drift(trend, 0, s2, mean));
        double low;
        if (quantiles.apply(0.0)[2] >= observed || observed == 0) {
            // within 95% of what no drift shows (a one-sided limit, as no drift has only one side)
            low = 0.0;
        } else {
            // the smallest true drift whose 97.5% point reaches the observed one
            double a = 0;
            double b = 1;
            for (int i = 0; i < 60 && b - a > BISECTION_TOLERANCE * b; i++) {
                double m = 0.5 * (a + b);
                if (quantiles.apply(m)[1] >= observed) {
                    b = m;
                } else {
                    a = m;
                }
            }
            low = b * observed;
        }
        // the largest true drift whose 2.5% point stays at or below the observed one
        double top = 1 + 10 * se / observed;
        while (quantiles.apply(top)[0] <= observed && top < 1e6) {
            top *= 2;
        }
        double a = 1;
        double b = top;
        for (int i = 0; i < 60 && b - a > BISECTION_TOLERANCE * a; i++) {
            double m = 0.5 * (a + b);
            if (quantiles.apply(m)[0] <= observed) {
                a = m;
            } else {
                b = m;
            }
        }
        return new Interval(low, a * observed);
    }

    /**
     * A residual series modelled as AR(1), {@code rho_k = phi^k}, after the quadratic fit: the traces the
     * intervals need, with {@code P = I - H} the fit's residual projection and {@code R} the correlation
     * matrix (exact for Gaussian AR(1) data, evaluated in O(n^2) through the fit's three basis vectors):
     * {@code tr(PR)} (so {@code E[RSS] = gamma0 tr(PR)}), {@code tr(PRPR)} (so {@code Var(RSS) = 2 gamma0^2
     * tr(PRPR)}), and {@code b' R b} of the linear and quadratic basis vectors (the fit's coefficient
     * variances, {@code gamma0 b' R b / |b|^4}). {@code phi} is found so that the expected lag-1
     * correlation of the residuals, {@code tr(P R P L) / tr(P R)} ({@code L} the symmetric lag-1 matrix),
     * equals the observed one: the fit's own bias on the correlation (strong for slow fluctuations) is
     * undone.
     */
    record Ar1(double phi, double trPR, double trPRPR, double bRb1, double bRb2, int n) {

        /** {@code nu^2 tr(PRPR) / (nu tr(PR))^2 ... }: the factor by which Var(RSS) exceeds white noise's. */
        double varianceFactor() {
            double nu = n - 3;
            return trPRPR * nu / (trPR * trPR);
        }

        /** The series variance {@code gamma0} from its residual variance (divisor n - 3). */
        double gamma0(double residualVariance) {
            return residualVariance * (n - 3) / trPR;
        }

        static Ar1 white(int n) {
            QuadraticTrend q = new QuadraticTrend(n);
            return new Ar1(0, n - 3, n - 3, q.norm1(), q.norm2(), n);
        }

        /** As {@link #ofLag1(double, QuadraticTrend, double)} for several margins, the coefficient found once. */
        static Ar1[] ofLag1(double observed, QuadraticTrend q, double... margins) {
            Ar1 a = solve(observed, q);
            Ar1[] out = new Ar1[margins.length];
            for (int i = 0; i < margins.length; i++) {
                out[i] = withMargin(a, observed, q, margins[i]);
            }
            return out;
        }

        /**
         * The AR(1) model whose fitted residuals would show {@code observed} as their lag-1 correlation; a
         * significant correlation (above 2 / sqrt(n)) is taken {@code margin} standard errors higher
         * ({@code sqrt((1 - phi^2) / n)} each), so that the intervals carry the uncertainty of the correlation
         * itself (a margin of 1.5 to 2 is our choice, checked by the seeded coverage tests).
         */
        static Ar1 ofLag1(double observed, QuadraticTrend q, double margin) {
            return withMargin(solve(observed, q), observed, q, margin);
        }

        private static Ar1 withMargin(Ar1 a, double observed, QuadraticTrend q, double margin) {
            int n = q.samples();
            if (observed > 2 / Math.sqrt(n)) {
                return at(q, Math.min(0.995, a.phi() + margin * Math.sqrt((1 - a.phi() * a.phi()) / n)));
            }
            return a;
        }

        private static Ar1 solve(double observed, QuadraticTrend q) {
            double lo = -0.9;
            double hi = 0.995;
            Lag1 lag1 = new Lag1(q);
            if (lag1.expected(lo) >= observed) {
                return at(q, lo);
            }
            if (lag1.expected(hi) <= observed) {
                return at(q, hi);
            }
            for (int i = 0; i < 50 && hi - lo > BISECTION_TOLERANCE; i++) {
                double m = 0.5 * (lo + hi);
                if (lag1.expected(m) < observed) {
                    lo = m;
                } else {
                    hi = m;
                }
            }
            return at(q, 0.5 * (lo + hi));
        }

        private static double[][] basis(QuadraticTrend q) {
            int n = q.samples();
            double[][] b = new double[3][n];
            for (int t = 0; t < n; t++) {
                b[0][t] = 1;
                b[1][t] = q.p1(t);
                b[2][t] = q.p2(t);
            }
            return b;
        }

        /** {@code R v} for the AR(1) correlation matrix, in O(n) by two recursions. */
        private static double[] times(double phi, double[] v) {
            int n = v.length;
            double[] fwd = new double[n];
            double[] bwd = new double[n];
            for (int i = 0; i < n; i++) {
                fwd[i] = v[i] + (i > 0 ? phi * fwd[i - 1] : 0);
            }
            for (int i = n - 1; i >= 0; i--) {
                bwd[i] = v[i] + (i < n - 1 ? phi * bwd[i + 1] : 0);
            }
            double[] out = new double[n];
            for (int i = 0; i < n; i++) {
                out[i] = fwd[i] + bwd[i] - v[i];
            }
            return out;
        }

        private static double dot(double[] a, double[] b) {
            double s = 0;
            for (int i = 0; i < a.length; i++) {
                s += a[i] * b[i];
            }
            return s;
        }

        /**
         * {@code tr(P R P L) / tr(P R)}, the lag-1 correlation the fit's residuals show on average, as a
         * function of {@code phi}; what does not depend on {@code phi} (the basis, its lags and norms) is
         * computed once.
         */
        private static final class Lag1 {
            private final int n;
            private final double[][] b;
            private final double[][] lb = new double[3][];
            private final double[] norm = new double[3];

            Lag1(QuadraticTrend q) {
                n = q.samples();
                b = basis(q);
                for (int k = 0; k < 3; k++) {
                    lb[k] = lag(b[k]);
                    norm[k] = dot(b[k], b[k]);
                }
            }

            /** The expected lag-1 correlation of the residuals for AR(1) coefficient {@code phi}. */
            double expected(double phi) {
                double[][] rb = new double[3][];
                for (int k = 0; k < 3; k++) {
                    rb[k] = times(phi, b[k]);
                }
                // tr(R) = n, tr(H R) = sum b'Rb / |b|^2
                double trR = n;
                double trHR = 0;
                for (int k = 0; k < 3; k++) {
                    trHR += dot(b[k], rb[k]) / norm[k];
                }
                // tr(RL) = (n - 1) phi; tr(HRL) = tr(RLH) = sum b' L R b / |b|^2 = sum (Lb)'(Rb) / |b|^2 (R, L
                // symmetric); tr(RHL) = sum b' L R b / |b|^2 too; tr(HRHL) = sum_kl (b_k' R b_l)(b_l' L b_k) /
                // (|b_k|^2 |b_l|^2)
                double trRL = (n - 1) * phi;
                double trHRL = 0;
                double trHRHL = 0;
                for (int k = 0; k < 3; k++) {
                    trHRL += dot(lb[k], rb[k]) / norm[k];
                    for (int l = 0; l < 3; l++) {
                        trHRHL += dot(b[k], rb[l]) * dot(b[l], lb[k]) / (norm[k] * norm[l]);
                    }
                }
                double num = trRL - 2 * trHRL + trHRHL;
                return num / (trR - trHR);
            }
        }

        /** {@code L v}, L the symmetric lag-1 matrix (1/2 beside the diagonal), scaled so tr(RL) = (n-1) phi. */
        private static double[] lag(double[] v) {
            int n = v.length;
            double[] out = new double[n];
            for (int i = 0; i < n; i++) {
                out[i] = 0.5 * ((i > 0 ? v[i - 1] : 0) + (i < n - 1 ? v[i + 1] : 0));
            }
            return out;
        }

        static Ar1 at(QuadraticTrend q, double phi) {
            int n = q.samples();
            double[][] b = basis(q);
            double[][] rb = new double[3][];
            double[] norm = new double[3];
            for (int k = 0; k < 3; k++) {
                rb[k] = times(phi, b[k]);
                norm[k] = dot(b[k], b[k]);
            }
            double trHR = 0;
            double trHRR = 0;
            double trHRHR = 0;
            for (int k = 0; k < 3; k++) {
                trHR += dot(b[k], rb[k]) / norm[k];
                trHRR += dot(rb[k], rb[k]) / norm[k];
                for (int l = 0; l < 3; l++) {
                    double c = dot(b[k], rb[l]);
                    trHRHR += c * c / (norm[k] * norm[l]);
                }
            }
            // tr(RR) = sum_ij phi^(2|i-j|) = n + 2 sum_{d=1}^{n-1} (n - d) phi^(2d)
            double trRR = n;
            double p2 = phi * phi;
            double pw = 1;
            for (int d = 1; d < n; d++) {
                pw *= p2;
                trRR += 2 * (n - d) * pw;
            }
            double trPR = n - trHR;
            double trPRPR = trRR - 2 * trHRR + trHRHR;
            return new Ar1(phi, trPR, trPRPR, dot(b[1], rb[1]), dot(b[2], rb[2]), n);
        }
    }
}
