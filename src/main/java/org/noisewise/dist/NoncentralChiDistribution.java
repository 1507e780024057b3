package org.noisewise.dist;

import org.apache.commons.math3.distribution.AbstractRealDistribution;
import org.apache.commons.math3.random.RandomGenerator;
import org.apache.commons.math3.random.Well19937c;
import org.apache.commons.math3.special.Gamma;
import org.noisewise.math.ChiMoments;
import org.noisewise.math.PoissonMixture;

/**
 * Magnitude of an L-channel root-sum-of-squares combination of complex Gaussian channels:
 * {@code M = sqrt(sum_c |A_c + n_c|^2)} with per-component noise SD {@code sigma} and total signal
 * amplitude {@code A = sqrt(sum |A_c|^2)}. {@code M / sigma} is noncentral chi with {@code 2L}
 * degrees of freedom and noncentrality {@code A / sigma} (Constantinides, Atalar and McVeigh 1997,
 * MRM 38:852); {@code L = 1} is the Rice distribution and {@code A = 0} the central chi
 * ({@code L = 1}: Rayleigh).
 *
 * <p>Density and distribution function use the Poisson mixture of central chi-squares:
 * {@code (M/sigma)^2 | j ~ chi^2(2L + 2j)}, {@code j ~ Poisson(A^2 / 2 sigma^2)}, so
 * {@code F(x) = sum_j Pois(j) P(L + j, x^2 / 2 sigma^2)} with Commons Math's regularized gamma.
 */
public class NoncentralChiDistribution extends AbstractRealDistribution {

    private static final long serialVersionUID = 1L;
    private static final double DEFAULT_INVERSE_ACCURACY = 1e-9;

    private final int channels;
    private final double amplitude;
    private final double sigma;
    private final double mixtureMean;

    public NoncentralChiDistribution(int channels, double amplitude, double sigma) {
        this(new Well19937c(), channels, amplitude, sigma);
    }

    public NoncentralChiDistribution(RandomGenerator rng, int channels, double amplitude, double sigma) {
        super(rng);
        if (channels < 1) {
            throw new IllegalArgumentException("channel count must be >= 1, was " + channels);
        }
        if (!(amplitude >= 0) || Double.isInfinite(amplitude)) {
            throw new IllegalArgumentException("amplitude must be finite and >= 0, was " + amplitude);
        }
        if (!(sigma > 0) || Double.isInfinite(sigma)) {
            throw new IllegalArgumentException("sigma must be finite and > 0, was " + sigma);
        }
        this.channels = channels;
        this.amplitude = amplitude;
        this.sigma = sigma;
        double theta = amplitude / sigma;
        this.mixtureMean = 0.5 * theta * theta;
    }

    public int getChannels() {
        return channels;
    }

    public double getAmplitude() {
        return amplitude;
    }

    public double getSigma() {
        return sigma;
    }

    @Override
    public double density(double x) {
        if (!(x > 0) || Double.isInfinite(x)) {
            return 0.0;
        }
        double u = x / sigma;
        double logU = Math.log(u);
        double halfU2 = 0.5 * u * u;
        // density of sigma*chi(2k) at x: 2 u^(2k-1) e^(-u^2/2) / (2^k Gamma(k) sigma)
        return PoissonMixture.sum(mixtureMean, j -> {
            double k = channels + j;
            return Math.exp(Math.log(2.0) + (2 * k - 1) * logU - halfU2 - k * Math.log(2.0)
                    - Gamma.logGamma(k)) / sigma;
        });
    }

    @Override
    public double cumulativeProbability(double x) {
        if (!(x > 0)) {
            return 0.0;
        }
        if (Double.isInfinite(x)) {
            return 1.0;
        }
        double half = 0.5 * (x / sigma) * (x / sigma);
        double p = PoissonMixture.sum(mixtureMean, j -> Gamma.regularizedGammaP(channels + j, half));
        return Math.min(1.0, Math.max(0.0, p));
    }

    @Override
    public double getNumericalMean() {
        return sigma * ChiMoments.mean(channels, amplitude / sigma);
    }

    @Override
    public double getNumericalVariance() {
        return sigma * sigma * ChiMoments.variance(channels, amplitude / sigma);
    }

    @Override
    public double getSupportLowerBound() {
        return 0.0;
    }

    @Override
    public double getSupportUpperBound() {
        return Double.POSITIVE_INFINITY;
    }

    @Override
    public boolean isSupportLowerBoundInclusive() {
        return true;
    }

    @Override
    public boolean isSupportUpperBoundInclusive() {
        return false;
    }

    @Override
    public boolean isSupportConnected() {
        return true;
    }

    @Override
    protected double getSolverAbsoluteAccuracy() {
        return DEFAULT_INVERSE_ACCURACY * Math.max(sigma, amplitude);
    }

    /** Draws one magnitude by simulating the channels (signal in the first channel's real part). */
    @Override
    public double sample() {
        double re = amplitude + sigma * random.nextGaussian();
        double im = sigma * random.nextGaussian();
        double sum = re * re + im * im;
        for (int c = 1; c < channels; c++) {
            double a = sigma * random.nextGaussian();
            double b = sigma * random.nextGaussian();
            sum += a * a + b * b;
        }
        return Math.sqrt(sum);
    }
}
