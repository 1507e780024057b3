package org.noisewise.diagnose;

import java.util.ArrayList;
import java.util.List;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;

/**
 * Do several background regions share one sigma? Each region's {@code sum M^2} is Gamma with shape
 * {@code k_i = L n_i} (effective pixels) and scale {@code 2 sigma_i^2}; the likelihood-ratio test
 * of equal scales is {@code T = 2 sum k_i ln(s2_pool / s2_i)}, chi-square with {@code r - 1} degrees of
 * freedom, {@code s2_pool = sum k_i s2_i / sum k_i}. Grouping the regions by side (left/right against
 * above/below the object) separates ghosting along one direction from noise that varies smoothly
 * across the image (parallel imaging g-factor, coil profiles, filters).
 */
public final class RegionAgreement {

    private RegionAgreement() {
    }

    /** One region's ML variance estimate, its gamma shape (L * effective pixels) and its side. */
    public record Part(String name, double variance, double shape, boolean horizontal) {
    }

    /** The test result. */
    public record Result(double statistic, int dof, double p) {
    }

    public static Result test(List<Part> parts) {
        if (parts.size() < 2) {
            return new Result(0, 0, 1.0);
        }
        double k = 0;
        double kv = 0;
        for (Part p : parts) {
            k += p.shape();
            kv += p.shape() * p.variance();
        }
        double pooled = kv / k;
        double t = 0;
        for (Part p : parts) {
            t += 2 * p.shape() * Math.log(pooled / p.variance());
        }
        int dof = parts.size() - 1;
        double pv = 1.0 - new ChiSquaredDistribution(null, dof).cumulativeProbability(Math.max(0, t));
        return new Result(t, dof, pv);
    }

    /** The test on the two side groups, each pooled into one part. */
    public static Result sides(List<Part> parts) {
        List<Part> groups = new ArrayList<>();
        for (boolean h : new boolean[] {true, false}) {
            double k = 0;
            double kv = 0;
            for (Part p : parts) {
                if (p.horizontal() == h) {
                    k += p.shape();
                    kv += p.shape() * p.variance();
                }
            }
            if (k > 0) {
                groups.add(new Part(h ? "left/right" : "above/below", kv / k, k, h));
            }
        }
        return test(groups);
    }

    /** The test within one side group. */
    public static Result within(List<Part> parts, boolean horizontal) {
        return test(parts.stream().filter(p -> p.horizontal() == horizontal).toList());
    }

    /** Pooled variance of one side group, or NaN. */
    public static double pooled(List<Part> parts, boolean horizontal) {
        double k = 0;
        double kv = 0;
        for (Part p : parts) {
            if (p.horizontal() == horizontal) {
                k += p.shape();
                kv += p.shape() * p.variance();
            }
        }
        return k > 0 ? kv / k : Double.NaN;
    }
}
