package org.noisewise.estimate;

import java.util.Locale;

/**
 * The four background estimators of the per-channel noise SD sigma. Each divides a statistic of the
 * background magnitude by its value for {@code sigma = 1} under the central chi(2L) model
 * (L = 1: Rayleigh; Henkelman 1985, Gudbjartsson and Patz 1995, Constantinides et al. 1997).
 */
public enum SigmaEstimator {
    /** {@code sigma = mean / beta_L}; L = 1: mean / 1.2533. */
    MEAN("mean", "Mean-based"),
    /** {@code sigma = SD / sqrt(2L - beta_L^2)}; L = 1: SD / 0.6551. */
    SD("sd", "SD-based"),
    /** {@code sigma^2 = sum M^2 / (2 L N)}, the maximum-likelihood estimate; exact chi-square interval. */
    ML("ml", "Maximum likelihood"),
    /** {@code sigma = median / median(chi_2L)}; L = 1: median / 1.1774. Robust to a few outliers. */
    MEDIAN("median", "Median-based");

    private final String key;
    private final String label;

    SigmaEstimator(String key, String label) {
        this.key = key;
        this.label = label;
    }

    /** Short stable key used in JSON, CSV and command-line options. */
    public String key() {
        return key;
    }

    /** Human label used in dialogs and tables. */
    public String label() {
        return label;
    }

    /** Parses a key or label, case-insensitively. */
    public static SigmaEstimator parse(String text) {
        String t = text.trim().toLowerCase(Locale.ROOT);
        for (SigmaEstimator e : values()) {
            if (e.key.equals(t) || e.label.toLowerCase(Locale.ROOT).equals(t)) {
                return e;
            }
        }
        throw new IllegalArgumentException("unknown estimator '" + text + "': use mean, sd, ml or median");
    }

    public static String[] labels() {
        SigmaEstimator[] v = values();
        String[] out = new String[v.length];
        for (int i = 0; i < v.length; i++) {
            out[i] = v[i].label;
        }
        return out;
    }
}
