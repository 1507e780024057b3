package org.noisewise.estimate;

/** The confidence and significance levels used throughout, defined once. */
public final class Levels {

    /** Two-sided 95% normal quantile: every reported interval is a 95% interval. */
    public static final double Z95 = 1.959963984540054;
    /** Two-sided 99% normal quantile, for tests at {@link #ALPHA}. */
    public static final double Z99 = 2.5758293035489004;
    /** Significance level of every diagnostic test: evidence against a model needs p below 1%. */
    public static final double ALPHA = 0.01;

    private Levels() {
    }
}
