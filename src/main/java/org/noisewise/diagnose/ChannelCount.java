package org.noisewise.diagnose;

import java.util.TreeMap;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.optim.MaxEval;
import org.apache.commons.math3.optim.nonlinear.scalar.GoalType;
import org.apache.commons.math3.optim.univariate.BrentOptimizer;
import org.apache.commons.math3.optim.univariate.SearchInterval;
import org.apache.commons.math3.optim.univariate.UnivariateObjectiveFunction;
import org.apache.commons.math3.special.Gamma;

/**
 * The effective number of channels L of a root-sum-of-squares background, estimated jointly with
 * sigma. Background {@code M^2 / (2 sigma^2)} is Gamma(L, 1) (central chi-square with 2L degrees of
 * freedom, halved), so L is the maximum-likelihood gamma shape of {@code Y = M^2}:
 * {@code ln L - psi(L) = ln(mean Y) - mean(ln Y)}, and {@code sigma^2 = mean(Y) / (2L)}. Its
 * interval uses the Fisher information, {@code Var(L) = L / (n (L psi'(L) - 1))}, with the effective
 * pixel count when pixels are correlated. Correlated channels, parallel imaging, filtering and
 * combinations other than sum of squares give non-integer or shrunken L.
 *
 * <p>Values stored as whole multiples of a step (8- and 16-bit data, integer NIfTI) are not
 * continuous: a stored value {@code k} stands for every magnitude within half a step of it, which the
 * moment equation above misreads when sigma is a few steps (the logarithm of small rounded values).
 * For them L and sigma maximise the likelihood of the counts of stored values (interval censoring):
 * {@code P(k) = G(L, m_hi^2 / 2 sigma^2) - G(L, m_lo^2 / 2 sigma^2)}, {@code G} the regularised lower
 * incomplete gamma function (Commons Math), {@code m_lo, m_hi} the half-step edges, conditioned on the
 * value not being stored as zero (zeros are left out as above); the interval from the observed
 * information.
 */
public final class ChannelCount {

    private static final double Z975 = org.noisewise.estimate.Levels.Z95;

    private ChannelCount() {
    }

    /** The estimate. {@code pixels} counts the non-zero pixels used. */
    public record Estimate(double channels, double low, double high, double sigma, int pixels) {
        /** The nearest whole channel count, at least 1. */
        public int rounded() {
            return (int) Math.max(1, Math.round(channels));
        }

        public boolean covers(double l) {
            return l >= low && l <= high;
        }
    }

    /**
     * @param background     background magnitudes; exact zeros are left out (they carry no information
     *                       on the shape and mark masking, which other checks report)
     * @param effectiveRatio effective / actual pixel count, in (0, 1]
     * @return the estimate, or {@code null} when fewer than 10 non-zero pixels remain or they are all equal
     */
    public static Estimate estimate(double[] background, double effectiveRatio) {
        return estimate(background, effectiveRatio, 0.0, 0.0);
    }

    /**
     * The estimate for values stored as {@code offset + step * k} (step 0: continuous values).
     *
     * @see #estimate(double[], double)
     */
    public static Estimate estimate(double[] background, double effectiveRatio, double step, double offset) {
        Estimate moment = moment(background, effectiveRatio);
        if (!(step > 0) || moment == null) {
            return moment;
        }
        return binned(background, effectiveRatio, step, offset, moment);
    }

    private static Estimate moment(double[] background, double effectiveRatio) {
        int n = 0;
        double sumY = 0;
        double sumLogY = 0;
        for (double m : background) {
            if (m > 0) {
                double y = m * m;
                sumY += y;
                sumLogY += Math.log(y);
                n++;
            }
        }
        if (n < 10) {
            return null;
        }
        double meanY = sumY / n;
        double s = Math.log(meanY) - sumLogY / n;
        if (!(s > 1e-12)) {
            return null;
        }
        double lo = 1e-3;
        double hi = 1e7;
        double l = new BrentSolver(1e-12, 1e-10).solve(500, k -> Math.log(k) - Gamma.digamma(k) - s, lo, hi);
        double nEff = Math.max(2.0, n * Math.min(1.0, effectiveRatio));
        double info = l * Gamma.trigamma(l) - 1.0;
        double se = Math.sqrt(l / (nEff * Math.max(info, 1e-300)));
        double sigma = Math.sqrt(meanY / (2.0 * l));
        return new Estimate(l, Math.max(0.0, l - Z975 * se), l + Z975 * se, sigma, n);
    }

    /** Interval-censored maximum likelihood on the counts of stored values (see the class description). */
    private static Estimate binned(double[] background, double effectiveRatio, double step, double offset,
                                   Estimate start) {
        TreeMap<Long, Integer> counts = new TreeMap<>();
        int n = 0;
        for (double m : background) {
            if (m > 0) {
                counts.merge(Math.round((m - offset) / step), 1, Integer::sum);
                n++;
            }
        }
        if (counts.size() < 3) {
            return start;
        }
        int bins = counts.size();
        double[] lo = new double[bins];
        double[] hi = new double[bins];
        double[] w = new double[bins];
        int b = 0;
        double floor = Double.POSITIVE_INFINITY;
        for (var e : counts.entrySet()) {
            double centre = offset + step * e.getKey();
            lo[b] = Math.max(0.0, centre - step / 2);
            hi[b] = centre + step / 2;
            w[b] = e.getValue();
            floor = Math.min(floor, lo[b]);
            b++;
        }
        double cut = floor;
        // the log-likelihood, in log L and log sigma
        java.util.function.DoubleBinaryOperator ll = (logL, logS) -> {
            double l = Math.exp(logL);
            double s2 = 2 * Math.exp(2 * logS);
            double total = 1.0 - Gamma.regularizedGammaP(l, cut * cut / s2);
            if (!(total > 0)) {
                return -1e300;
            }
            double sum = 0;
            for (int i = 0; i < lo.length; i++) {
                double p = Gamma.regularizedGammaP(l, hi[i] * hi[i] / s2) - Gamma.regularizedGammaP(l, lo[i] * lo[i] / s2);
                sum += w[i] * Math.log(Math.max(p / total, 1e-300));
            }
            return sum;
        };
        double logL = Math.log(start.channels());
        double logS = Math.log(start.sigma());
        BrentOptimizer opt = new BrentOptimizer(1e-10, 1e-12);
        // alternate one-dimensional maximisations (the surface is smooth and unimodal near the moment start)
        for (int it = 0; it < 60; it++) {
            final double fl = logL;
            double newS = opt.optimize(new MaxEval(200), GoalType.MAXIMIZE, new UnivariateObjectiveFunction(
                    x -> ll.applyAsDouble(fl, x)), new SearchInterval(logS - 1.5, logS + 1.5, logS)).getPoint();
            final double fs = newS;
            double newL = opt.optimize(new MaxEval(200), GoalType.MAXIMIZE, new UnivariateObjectiveFunction(
                    x -> ll.applyAsDouble(x, fs)), new SearchInterval(Math.max(Math.log(0.05), logL - 2.5), logL + 2.5,
                    logL)).getPoint();
            boolean done = Math.abs(newL - logL) < 1e-7 && Math.abs(newS - logS) < 1e-7;
            logL = newL;
            logS = newS;
            if (done) {
                break;
            }
        }
        // observed information in (log L, log sigma) by central differences
        double h = 1e-3;
        double f0 = ll.applyAsDouble(logL, logS);
        double fll = (ll.applyAsDouble(logL + h, logS) - 2 * f0 + ll.applyAsDouble(logL - h, logS)) / (h * h);
        double fss = (ll.applyAsDouble(logL, logS + h) - 2 * f0 + ll.applyAsDouble(logL, logS - h)) / (h * h);
        double fls = (ll.applyAsDouble(logL + h, logS + h) - ll.applyAsDouble(logL + h, logS - h)
                - ll.applyAsDouble(logL - h, logS + h) + ll.applyAsDouble(logL - h, logS - h)) / (4 * h * h);
        double det = fll * fss - fls * fls;
        double l = Math.exp(logL);
        double varLogL = det > 0 && fss < 0 ? -fss / det : Double.NaN;
        double ratio = Math.max(2.0 / n, Math.min(1.0, effectiveRatio));
        double se = Double.isFinite(varLogL) ? l * Math.sqrt(varLogL / ratio) : Double.POSITIVE_INFINITY;
        return new Estimate(l, Math.max(0.0, l - Z975 * se), l + Z975 * se, Math.exp(logS), n);
    }
}
