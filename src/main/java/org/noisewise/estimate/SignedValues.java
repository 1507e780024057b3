package org.noisewise.estimate;

import java.util.Locale;

/**
 * Magnitude images hold no negative values (a magnitude is a length; rounding a non-negative value
 * to a stored step keeps it non-negative). Values below zero mark a signed image: a phase-sensitive
 * or real-part reconstruction, or a difference of images, whose noise is Gaussian, so the Rice and
 * noncentral-chi models (and every correction built on them) do not apply. A region counts as signed
 * when more than 0.1% of its values (and at least one) are below zero.
 */
public final class SignedValues {

    /** Fraction of negative values above which a region is signed. */
    public static final double LIMIT = 0.001;

    private SignedValues() {
    }

    /** The number of values below zero. */
    public static int negatives(double[] values) {
        int n = 0;
        for (double v : values) {
            n += v < 0 ? 1 : 0;
        }
        return n;
    }

    /** The number of values below zero (NaN is not counted). */
    public static int negatives(float[] values) {
        int n = 0;
        for (float v : values) {
            n += v < 0 ? 1 : 0;
        }
        return n;
    }

    /** Refuses a signed plane where a method needs the magnitude model. */
    public static void requireMagnitude(float[] values, String where, String method) throws InputException {
        int neg = negatives(values);
        if (signed(neg, values.length)) {
            throw refusal(100.0 * neg / values.length, where, method);
        }
    }

    private static InputException refusal(double percent, String where, String method) {
        return new InputException(String.format(Locale.ROOT, "%.1f%% of the values in %s are below zero: this is not "
                + "a magnitude image (a phase-sensitive or real-part reconstruction, or a difference of images), and "
                + "%s rests on the magnitude noise model; measure the magnitude image, or use the difference or "
                + "repeated-acquisition method, which measure signed data with the Gaussian model", percent, where,
                method));
    }

    /** Whether {@code negatives} of {@code n} values make the region signed. */
    public static boolean signed(int negatives, long n) {
        return negatives > 0 && negatives > LIMIT * n;
    }

    /** The warning of a method that measures signed data with the Gaussian model. */
    public static Warning gaussianWarning(String region, int negatives, long n) {
        return new Warning("signed_data", String.format(Locale.ROOT, "%.1f%% of the values in region '%s' are below "
                + "zero: this is not a magnitude image (a phase-sensitive or real-part reconstruction, or a difference "
                + "of images), so the Gaussian model is used: the figures are the plain mean, SD and their ratio, "
                + "with no Rice or noncentral-chi correction", 100.0 * negatives / n, region));
    }

    /** Refuses signed values where a method needs the magnitude model. */
    public static void requireMagnitude(double[] values, String where, String method) throws InputException {
        int neg = negatives(values);
        if (signed(neg, values.length)) {
            throw refusal(100.0 * neg / values.length, where, method);
        }
    }
}
