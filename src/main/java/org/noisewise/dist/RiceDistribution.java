package org.noisewise.dist;

import org.apache.commons.math3.random.RandomGenerator;
import org.apache.commons.math3.random.Well19937c;
import org.noisewise.math.ScaledBessel;

/**
 * Rice distribution of a single-channel magnitude with true amplitude {@code A} and per-component
 * noise SD {@code sigma}: {@code p(M) = (M/sigma^2) exp(-(M^2+A^2)/2sigma^2) I0(AM/sigma^2)}
 * (Gudbjartsson and Patz 1995, MRM 34:910). The density is evaluated in the overflow-safe form
 * {@code (M/sigma^2) exp(-(M-A)^2/2sigma^2) I0e(AM/sigma^2)}; {@code A = 0} is the Rayleigh
 * distribution.
 */
public class RiceDistribution extends NoncentralChiDistribution {

    private static final long serialVersionUID = 1L;

    public RiceDistribution(double amplitude, double sigma) {
        this(new Well19937c(), amplitude, sigma);
    }

    public RiceDistribution(RandomGenerator rng, double amplitude, double sigma) {
        super(rng, 1, amplitude, sigma);
    }

    @Override
    public double density(double x) {
        if (!(x > 0) || Double.isInfinite(x)) {
            return 0.0;
        }
        double s2 = getSigma() * getSigma();
        double a = getAmplitude();
        double d = x - a;
        return (x / s2) * Math.exp(-d * d / (2 * s2)) * ScaledBessel.i0e(a * x / s2);
    }
}
