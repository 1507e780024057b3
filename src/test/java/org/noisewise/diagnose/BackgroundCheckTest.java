package org.noisewise.diagnose;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.noisewise.estimate.Warning;
import org.noisewise.sample.Phantoms;

class BackgroundCheckTest {

    private static double[] noise(long seed, int n, double sigma, int channels) {
        SplittableRandom rng = new SplittableRandom(seed);
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            v[i] = Phantoms.magnitude(rng, 0, sigma, channels);
        }
        return v;
    }

    private static List<String> codes(BackgroundCheck.Result r) {
        return r.reasons().stream().map(Warning::code).toList();
    }

    /** Our KS distance equals Commons Math's KolmogorovSmirnovTest statistic against Nakagami(L, 2L sigma^2). */
    @Test
    void ksDistanceMatchesCommonsMath() {
        double[] v = noise(1, 700, 2.0, 4);
        double[] sorted = v.clone();
        java.util.Arrays.sort(sorted);
        double commons = new org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest().kolmogorovSmirnovStatistic(
                new org.apache.commons.math3.distribution.NakagamiDistribution(4, 2.0 * 4 * 2.1 * 2.1), v);
        assertEquals(commons, BackgroundCheck.ksDistance(sorted, 4, 2.1), 1e-12);
    }

    /** A clean Rayleigh background is judged valid in at least 95% of seeded trials (no crying wolf). */
    @Test
    void cleanBackgroundIsValid() {
        int trials = 60;
        int valid = 0;
        for (int t = 0; t < trials; t++) {
            BackgroundCheck.Result r = BackgroundCheck.check(noise(1000 + t, 800, 3.0, 1), 1,
                    BackgroundCheck.Storage.floatingPoint());
            valid += r.verdict() == Verdict.VALID ? 1 : 0;
        }
        assertTrue(valid >= 0.95 * trials, valid + " of " + trials + " valid");
    }

    @Test
    void maskedBackgroundIsInvalid() {
        double[] v = noise(2, 1000, 3.0, 1);
        for (int i = 0; i < 300; i++) {
            v[i] = 0;
        }
        BackgroundCheck.Result r = BackgroundCheck.check(v, 1, BackgroundCheck.Storage.floatingPoint());
        assertEquals(Verdict.INVALID, r.verdict());
        assertTrue(codes(r).contains("masked_background"));
        assertEquals(0.3, r.zeroFraction(), 1e-12);
    }

    @Test
    void quantisedBackgroundIsFlagged() {
        double[] v = noise(3, 1000, 0.4, 1);
        for (int i = 0; i < v.length; i++) {
            v[i] = Math.round(v[i]);
        }
        BackgroundCheck.Result r = BackgroundCheck.check(v, 1, new BackgroundCheck.Storage(1.0, 65535));
        assertTrue(r.verdict() != Verdict.VALID);
        assertTrue(codes(r).contains("quantised"), codes(r).toString());
    }

    @Test
    void clippedValuesAreInvalid() {
        double[] v = noise(4, 1000, 3.0, 1);
        for (int i = 0; i < 5; i++) {
            v[i] = 255;
        }
        BackgroundCheck.Result r = BackgroundCheck.check(v, 1, new BackgroundCheck.Storage(1.0, 255));
        assertEquals(Verdict.INVALID, r.verdict());
        assertTrue(codes(r).contains("clipped"));
    }

    /** A ghost (a band of pixels at 8x sigma) in the background is caught by fit or estimator agreement. */
    @Test
    void ghostContaminationIsQuestionable() {
        double[] v = noise(5, 2000, 3.0, 1);
        SplittableRandom rng = new SplittableRandom(6);
        for (int i = 0; i < 160; i++) {
            v[i] = Phantoms.magnitude(rng, 24.0, 3.0, 1);
        }
        BackgroundCheck.Result r = BackgroundCheck.check(v, 1, BackgroundCheck.Storage.floatingPoint());
        assertEquals(Verdict.QUESTIONABLE, r.verdict());
        assertTrue(codes(r).contains("estimators_disagree") || codes(r).contains("poor_fit"), codes(r).toString());
        assertTrue(r.agreementP() < 0.01 && r.fitP() < 0.01, "both tests should see a ghost this strong");
    }

    /** Eight-channel data checked as one channel does not fit the Rayleigh model. */
    @Test
    void wrongChannelCountDoesNotFit() {
        double[] v = noise(7, 2000, 3.0, 8);
        BackgroundCheck.Result wrong = BackgroundCheck.check(v, 1, BackgroundCheck.Storage.floatingPoint());
        assertTrue(codes(wrong).contains("poor_fit"), codes(wrong).toString());
        BackgroundCheck.Result right = BackgroundCheck.check(v, 8, BackgroundCheck.Storage.floatingPoint());
        assertEquals(Verdict.VALID, right.verdict(), codes(right).toString());
    }

    /** The same pixels always give the same p-values (bootstrap seeded from the data). */
    @Test
    void deterministic() {
        double[] v = noise(8, 500, 3.0, 1);
        BackgroundCheck.Result a = BackgroundCheck.check(v, 1, BackgroundCheck.Storage.floatingPoint());
        BackgroundCheck.Result b = BackgroundCheck.check(v.clone(), 1, BackgroundCheck.Storage.floatingPoint());
        assertEquals(a.fitP(), b.fitP());
        assertEquals(a.agreementP(), b.agreementP());
    }

    /**
     * Issue 15.1: clean noise stored as integers (8- and 16-bit, sigma 1 to 20 stored steps, L = 1 and 8)
     * is judged valid in at least 95% of 100 seeded trials of 2,304 pixels, because the bootstrap
     * simulates values as they were stored. Before, 2-8 steps gave 0 valid trials of 100. The SD of the
     * Sheppard-corrected ML sigma stays unbiased within 1% even at one step (Sheppard's correction of the
     * second moment, step^2/12, closed form).
     */
    @Test
    void integerStoredNoiseIsValid() {
        int trials = 100;
        for (int bits : new int[] {8, 16}) {
            double max = bits == 8 ? 255 : 65535;
            BackgroundCheck.Storage storage = new BackgroundCheck.Storage(1.0, 0.0, 0.0, max);
            for (int l : new int[] {1, 8}) {
                for (double sigma : new double[] {1, 2, 5, 8, 12, 20}) {
                    if (bits == 8 && sigma * 6 * Math.sqrt(l) > max) {
                        continue;
                    }
                    int valid = 0;
                    double sum = 0;
                    for (int t = 0; t < trials; t++) {
                        double[] v = noise(90_000L * bits + 1000L * l + 10L * (long) sigma + t, 2304, sigma, l);
                        for (int i = 0; i < v.length; i++) {
                            v[i] = storage.stored(v[i]);
                        }
                        BackgroundCheck.Result r = BackgroundCheck.check(v, l, storage);
                        valid += r.verdict() == Verdict.VALID ? 1 : 0;
                        sum += r.sigma();
                    }
                    String cell = bits + "-bit, L=" + l + ", sigma " + sigma + " steps";
                    assertTrue(valid >= 95, cell + ": " + valid + " of " + trials + " valid");
                    assertEquals(sigma, sum / trials, 0.01 * sigma, cell + ": mean ML sigma");
                }
            }
        }
    }

    /** Issue 15.5: a background of one constant value (not 0) is invalid with a reason, whatever its level. */
    @Test
    void constantBackgroundIsInvalid() {
        double[] v = new double[4096];
        java.util.Arrays.fill(v, 7.0);
        BackgroundCheck.Result r = BackgroundCheck.check(v, 1, BackgroundCheck.Storage.floatingPoint());
        assertEquals(Verdict.INVALID, r.verdict());
        assertTrue(codes(r).contains("constant_background"), codes(r).toString());
    }
}
