package org.noisewise.estimate;

import java.util.Arrays;

/**
 * Order statistics of large samples without sorting them: the values at given ranks, in time linear
 * in the sample. One pass sorts the values into 2^20 buckets by the leading bits of an
 * order-preserving key of each double (sign, exponent and 8 mantissa bits: 256 buckets per octave),
 * a second gathers the few buckets that hold the wanted ranks, and only those are sorted. The result
 * is exactly that of sorting the whole sample ({@link Double#compare} order).
 */
public final class OrderStatistics {

    private static final int BITS = 20;

    private OrderStatistics() {
    }

    /** Bucket of {@code x}: the leading bits of a key whose unsigned order is the order of doubles. */
    private static int bucket(double x) {
        long b = Double.doubleToLongBits(x);
        long key = b ^ ((b >> 63) & Long.MAX_VALUE);
        return (int) ((key ^ Long.MIN_VALUE) >>> (64 - BITS));
    }

    /**
     * The values at 0-based {@code ranks} of {@code v} in ascending order ({@code v} is not changed).
     *
     * @throws IllegalArgumentException when a rank is outside {@code [0, v.length)}
     */
    public static double[] select(double[] v, int... ranks) {
        int n = v.length;
        for (int r : ranks) {
            if (r < 0 || r >= n) {
                throw new IllegalArgumentException("rank " + r + " outside a sample of " + n);
            }
        }
        if (n <= 1 << 16) {
            double[] sorted = v.clone();
            Arrays.sort(sorted);
            double[] out = new double[ranks.length];
            for (int i = 0; i < ranks.length; i++) {
                out[i] = sorted[ranks[i]];
            }
            return out;
        }
        int[] hist = new int[1 << BITS];
        for (double x : v) {
            hist[bucket(x)]++;
        }
        // the bucket of each rank and the rank's place inside it
        int[] bucketOf = new int[ranks.length];
        int[] within = new int[ranks.length];
        int[] order = ranksInOrder(ranks);
        int b = 0;
        long before = 0;
        for (int i : order) {
            while (before + hist[b] <= ranks[i]) {
                before += hist[b];
                b++;
            }
            bucketOf[i] = b;
            within[i] = (int) (ranks[i] - before);
        }
        // gather each distinct wanted bucket once (slot per bucket), then sort it
        int[] slot = new int[1 << BITS];
        Arrays.fill(slot, -1);
        int slots = 0;
        for (int i = 0; i < ranks.length; i++) {
            if (slot[bucketOf[i]] < 0) {
                slot[bucketOf[i]] = slots++;
            }
        }
        double[][] gathered = new double[slots][];
        int[] fill = new int[slots];
        for (int i = 0; i < ranks.length; i++) {
            int s = slot[bucketOf[i]];
            if (gathered[s] == null) {
                gathered[s] = new double[hist[bucketOf[i]]];
            }
        }
        for (double x : v) {
            int s = slot[bucket(x)];
            if (s >= 0) {
                gathered[s][fill[s]++] = x;
            }
        }
        for (double[] g : gathered) {
            Arrays.sort(g);
        }
        double[] out = new double[ranks.length];
        for (int i = 0; i < ranks.length; i++) {
            out[i] = gathered[slot[bucketOf[i]]][within[i]];
        }
        return out;
    }

    /** The indices of {@code ranks} in ascending order of rank. */
    private static int[] ranksInOrder(int[] ranks) {
        Integer[] idx = new Integer[ranks.length];
        for (int i = 0; i < idx.length; i++) {
            idx[i] = i;
        }
        Arrays.sort(idx, (a, c) -> Integer.compare(ranks[a], ranks[c]));
        int[] out = new int[idx.length];
        for (int i = 0; i < idx.length; i++) {
            out[i] = idx[i];
        }
        return out;
    }

    /** The sample median (the mean of the two middle values for an even count). */
    public static double median(double[] v) {
        int n = v.length;
        if (n % 2 == 1) {
            return select(v, n / 2)[0];
        }
        double[] m = select(v, n / 2 - 1, n / 2);
        return 0.5 * (m[0] + m[1]);
    }

    /**
     * The value a sort of {@code a[lo..hi]} would put at index {@code k} (Hoare's selection, median-of-three
     * pivots); reorders that range so that nothing before {@code k} is larger and nothing after it smaller.
     */
    public static double selectInPlace(double[] a, int lo, int hi, int k) {
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            double x = a[lo];
            double y = a[mid];
            double z = a[hi];
            double pivot = x < y ? (y < z ? y : Math.max(x, z)) : (x < z ? x : Math.max(y, z));
            int i = lo;
            int j = hi;
            while (i <= j) {
                while (a[i] < pivot) {
                    i++;
                }
                while (a[j] > pivot) {
                    j--;
                }
                if (i <= j) {
                    double t = a[i];
                    a[i] = a[j];
                    a[j] = t;
                    i++;
                    j--;
                }
            }
            if (k <= j) {
                hi = j;
            } else if (k >= i) {
                lo = i;
            } else {
                return a[k];
            }
        }
        return a[k];
    }
}
