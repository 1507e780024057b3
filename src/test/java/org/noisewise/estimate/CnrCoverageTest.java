package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import java.util.stream.IntStream;
import org.junit.jupiter.api.Test;
import org.noisewise.diagnose.BackgroundSnr;
import org.noisewise.math.ChiMoments;
import org.noisewise.testing.NoiseFields;

/**
 * Issue 22: the contrast-to-noise ratio's 95% interval holds the TRUE CNR {@code (A_s - A_c) / sigma} in
 * 93-97% of seeded trials (common practice for coverage checks), for one,
 * four and eight channels, a signal at 10 sigma and a contrast region at 1, 2 and 5 sigma, for the
 * background, difference and repeated (K = 4) methods as the measurement layer computes them: the
 * amplitudes corrected by the headline SNR's inversion, sigma from air (background) or pooled over the
 * two regions (difference, repeated). Regions of 16 x 16 pixels; four 10 x 10 air regions. 2,000 trials
 * per case (binomial SD 0.5% at 95%).
 *
 * <p>Where the contrast amplitude cannot be told from 0 in most trials (its own interval reaches the
 * floor: eight channels with the contrast at 1 sigma, when sigma comes from the regions themselves),
 * the interval is bounded by the edge of the parameter space and is conservative by design: there the
 * test asks for at least 93% and the {@code near_noise_floor} warning in most trials.
 */
class CnrCoverageTest {

    static final int W = 48;
    static final double SIGMA = 1.0;
    static final Region SIGNAL = rect("signal", 4, 4, 16, 16);
    static final Region CONTRAST = rect("contrast", 28, 4, 16, 16);
    static final List<Region> AIR = List.of(rect("bg1", 2, 26, 10, 10), rect("bg2", 14, 26, 10, 10),
            rect("bg3", 26, 26, 10, 10), rect("bg4", 38, 26, 10, 10));

    private static Region rect(String name, int x, int y, int w, int h) {
        return rect(name, x, y, w, h, W);
    }

    private static Region rect(String name, int x, int y, int w, int h, int width) {
        try {
            return Region.rectangle(name, x, y, w, h, width, width);
        } catch (InputException e) {
            throw new IllegalStateException(e);
        }
    }

    /** A plane: the two tissues and air, noise in every pixel of a region (the rest 0). */
    static float[] plane(SplittableRandom rng, double as, double ac, int l) {
        float[] p = new float[W * W];
        for (int i : SIGNAL.indices()) {
            p[i] = (float) NoiseFields.magnitude(rng, as, SIGMA, l);
        }
        for (int i : CONTRAST.indices()) {
            p[i] = (float) NoiseFields.magnitude(rng, ac, SIGMA, l);
        }
        for (Region r : AIR) {
            for (int i : r.indices()) {
                p[i] = (float) NoiseFields.magnitude(rng, 0, SIGMA, l);
            }
        }
        return p;
    }

    static Cnr background(SplittableRandom rng, double as, double ac, int l) throws InputException {
        float[] p = plane(rng, as, ac, l);
        SigmaEstimate s = BackgroundNoise.measure(p, W, AIR).estimates(l, 0.0).get(SigmaEstimator.ML);
        BackgroundSnr.Signal sig = BackgroundSnr.Signal.of(p, W, SIGNAL);
        BackgroundSnr.Signal con = BackgroundSnr.Signal.of(p, W, CONTRAST);
        return Cnr.of(sig.stats().mean(), sig.standardError(), con.stats().mean(), con.standardError(), s.sigma(),
                s.ci95(), l, "contrast");
    }

    static Cnr difference(SplittableRandom rng, double as, double ac, int l) throws InputException {
        float[] a = plane(rng, as, ac, l);
        float[] b = plane(rng, as, ac, l);
        DifferenceSnrResult ds = DifferenceSnr.analyze(a, b, W, SIGNAL, l);
        DifferenceSnrResult dc = DifferenceSnr.analyze(a, b, W, CONTRAST, l);
        double[] s = Cnr.pooledSigma(ds.figures(), dc.figures());
        return Cnr.of(ds.averageMean(), ds.averageStandardError(), dc.averageMean(), dc.averageStandardError(), s[0],
                new Interval(s[1], s[2]), l, "contrast");
    }

    static Cnr repeated(SplittableRandom rng, double as, double ac, int l) throws InputException {
        float[][] f = new float[4][];
        for (int t = 0; t < 4; t++) {
            f[t] = plane(rng, as, ac, l);
        }
        RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(f, W, W, null);
        RepeatedSnrResult rs = RepeatedAcquisitions.summarize(m, RepeatedAcquisitions.Frames.of(f), SIGNAL, l);
        RepeatedSnrResult rc = RepeatedAcquisitions.summarize(m, RepeatedAcquisitions.Frames.of(f), CONTRAST, l);
        double[] s = Cnr.pooledSigma(rs.figures(), rc.figures());
        return Cnr.of(rs.signalMean(), rs.meanStandardError(), rc.signalMean(), rc.meanStandardError(), s[0],
                new Interval(s[1], s[2]), l, "contrast");
    }

    interface Method {
        Cnr run(SplittableRandom rng, double as, double ac, int l) throws InputException;
    }

    /**
     * {coverage, mean CNR, fraction of trials whose contrast amplitude interval reaches 0 and warns,
     * coverage of the true contrast amplitude by its interval}.
     */
    private static double[] coverage(Method m, double as, double ac, int l, long seed, int trials) {
        double truth = (as - ac) / SIGMA;
        double[] acc = new double[4];
        IntStream.range(0, trials).parallel().forEach(t -> {
            try {
                Cnr c = m.run(new SplittableRandom(seed * 1_000_003L + t), as, ac, l);
                boolean floor = c.contrastAmplitudeCi95().low() <= 0
                        && c.warnings().stream().anyMatch(w -> w.code().equals("near_noise_floor"));
                synchronized (acc) {
                    acc[0] += c.ci95().contains(truth) ? 1 : 0;
                    acc[1] += c.cnr();
                    acc[2] += floor ? 1 : 0;
                    acc[3] += c.contrastAmplitudeCi95().contains(ac * SIGMA) ? 1 : 0;
                }
            } catch (InputException e) {
                throw new IllegalStateException(e);
            }
        });
        return new double[] {acc[0] / trials, acc[1] / trials, acc[2] / trials, acc[3] / trials};
    }

    @Test
    void intervalsCoverTheTrueCnr() {
        String[] names = {"background", "difference", "repeated"};
        Method[] methods = {CnrCoverageTest::background, CnrCoverageTest::difference, CnrCoverageTest::repeated};
        List<String> out = new ArrayList<>();
        List<String> failures = new ArrayList<>();
        int trials = 2000;
        for (int k = 0; k < 3; k++) {
            for (int l : new int[] {1, 4, 8}) {
                for (double ac : new double[] {1, 2, 5}) {
                    double[] r = coverage(methods[k], 10, ac, l, 100L * k + 10L * l + (long) ac, trials);
                    boolean atFloor = r[2] > 0.5;
                    String line = String.format(Locale.ROOT, "%s L=%d contrast %.0f: %.1f%% (mean CNR %.3f, truth %.0f;"
                            + " at the floor in %.0f%% of trials; contrast amplitude covered %.1f%%)", names[k], l, ac,
                            100 * r[0], r[1], 10 - ac, 100 * r[2], 100 * r[3]);
                    out.add(line);
                    if (r[0] < 0.93 || r[0] > 0.97 && !atFloor) {
                        failures.add(line);
                    }
                    // the contrast amplitude's own interval: 93-97%, except where sigma comes from the regions of
                    // an 8-channel image and the amplitude is within 2 sigma of 0 (difference method): there the
                    // difference sigma's own small low bias (about 0.8% at 8 channels) is multiplied by the
                    // inversion's steepness, and 91% is asked (documented in the README)
                    boolean steep = k == 1 && l == 8 && ac <= 2;
                    if (r[3] < (steep ? 0.91 : 0.93) || r[3] > 0.97) {
                        failures.add("amplitude " + line);
                    }
                    // the bias correction: the mean CNR within 0.1 sigma of the truth (the plain CNR is 0.5-2.7 low here)
                    if (Math.abs(r[1] - (10 - ac)) > 0.1) {
                        failures.add("mean " + line);
                    }
                }
            }
        }
        out.forEach(s -> System.out.println("cnr coverage " + s));
        assertTrue(failures.isEmpty(), "outside 93-97%: " + failures);
        // the conservative cases are only those the amplitude cannot be told from 0: none with the contrast at 5 sigma
        assertTrue(out.stream().filter(s -> s.contains("contrast 5")).noneMatch(s -> s.contains("at the floor in 100%")));
    }

    /**
     * Beyond white noise: complex noise smoothed over 3 x 3 pixels (neighbour correlation 2/3, each
     * region's effective pixel count about a fifth of its pixels; exact correlation in the noise
     * helper), and values stored as integers with sigma = 2 (amplitudes 20 and 4, i.e. 10 and 2 sigma),
     * on a 64 x 64 image with 28 x 28 tissue regions (as large as a user's), each method given the storage
     * step as the measurement layer gives it (Sheppard's correction). Same band: 93-97% of 2,000 trials.
     */
    @Test
    void correlatedNoiseAndIntegerStorage() {
        List<String> out = new ArrayList<>();
        List<String> failures = new ArrayList<>();
        String[] names = {"background", "difference", "repeated"};
        for (int k = 0; k < 3; k++) {
            for (int l : new int[] {1, 4}) {
                for (boolean integer : new boolean[] {false, true}) {
                    double sigma = integer ? 2.0 : 1.0;
                    NoiseFields.Kind kind = integer ? NoiseFields.Kind.WHITE : NoiseFields.Kind.BOX;
                    int method = k;
                    int trials = 2000;
                    double truth = 8;
                    int[] hit = new int[1];
                    IntStream.range(0, trials).parallel().forEach(t -> {
                        SplittableRandom rng = new SplittableRandom(9_000_000L + 1000L * (10 * method + l)
                                + (integer ? 500 : 0) + t);
                        try {
                            Cnr c = general(rng, method, kind, 10 * sigma, 2 * sigma, sigma, l, integer);
                            synchronized (hit) {
                                hit[0] += c.ci95().contains(truth) ? 1 : 0;
                            }
                        } catch (InputException e) {
                            throw new IllegalStateException(e);
                        }
                    });
                    double cov = (double) hit[0] / trials;
                    String line = String.format(Locale.ROOT, "%s L=%d %s: %.1f%%", names[k], l,
                            integer ? "integer storage" : "3x3 correlated noise", 100 * cov);
                    out.add(line);
                    if (cov < 0.93 || cov > 0.97) {
                        failures.add(line);
                    }
                }
            }
        }
        out.forEach(x -> System.out.println("cnr coverage " + x));
        assertTrue(failures.isEmpty(), "outside 93-97%: " + failures);
    }

    /** The larger image of the correlated-noise cases: 64 x 64, tissue regions of 28 x 28, four 14 x 14 air regions. */
    static final int W2 = 64;
    static final Region SIGNAL2 = rect2("signal", 4, 4, 28, 28);
    static final Region CONTRAST2 = rect2("contrast", 34, 4, 28, 28);
    static final List<Region> AIR2 = List.of(rect2("bg1", 2, 40, 14, 14), rect2("bg2", 18, 40, 14, 14),
            rect2("bg3", 34, 40, 14, 14), rect2("bg4", 50, 40, 14, 14));

    private static Region rect2(String name, int x, int y, int w, int h) {
        return rect(name, x, y, w, h, W2);
    }

    /** A plane of the two tissues and air with noise of the given kind, optionally rounded to integers. */
    static float[] plane(SplittableRandom rng, NoiseFields.Kind kind, double as, double ac, double sigma, int l,
                         boolean integer) {
        double[] sum = new double[W2 * W2];
        double[] amp = new double[W2 * W2];
        for (int i : SIGNAL2.indices()) {
            amp[i] = as / Math.sqrt(l);
        }
        for (int i : CONTRAST2.indices()) {
            amp[i] = ac / Math.sqrt(l);
        }
        for (int c = 0; c < l; c++) {
            double[][] f = NoiseFields.complex(rng, kind, W2, W2);
            for (int i = 0; i < W2 * W2; i++) {
                double re = amp[i] + sigma * f[0][i];
                double im = sigma * f[1][i];
                sum[i] += re * re + im * im;
            }
        }
        float[] p = new float[W2 * W2];
        for (int i = 0; i < p.length; i++) {
            double m = Math.sqrt(sum[i]);
            p[i] = (float) (integer ? Math.round(m) : m);
        }
        return p;
    }

    static Cnr general(SplittableRandom rng, int method, NoiseFields.Kind kind, double as, double ac, double sigma,
                       int l, boolean integer) throws InputException {
        if (method == 0) {
            float[] p = plane(rng, kind, as, ac, sigma, l, integer);
            SigmaEstimate s = BackgroundNoise.measure(p, W2, AIR2).estimates(l, integer ? 1.0 : 0.0)
                    .get(SigmaEstimator.ML);
            BackgroundSnr.Signal sig = BackgroundSnr.Signal.of(p, W2, SIGNAL2);
            BackgroundSnr.Signal con = BackgroundSnr.Signal.of(p, W2, CONTRAST2);
            return Cnr.of(sig.stats().mean(), sig.standardError(), con.stats().mean(), con.standardError(), s.sigma(),
                    s.ci95(), l, "contrast");
        }
        if (method == 1) {
            float[] a = plane(rng, kind, as, ac, sigma, l, integer);
            float[] b = plane(rng, kind, as, ac, sigma, l, integer);
            double step = integer ? 1.0 : 0.0;
            DifferenceSnrResult ds = DifferenceSnr.analyze(a, b, W2, SIGNAL2, l, step);
            DifferenceSnrResult dc = DifferenceSnr.analyze(a, b, W2, CONTRAST2, l, step);
            double[] s = Cnr.pooledSigma(ds.figures(), dc.figures());
            return Cnr.of(ds.averageMean(), ds.averageStandardError(), dc.averageMean(), dc.averageStandardError(),
                    s[0], new Interval(s[1], s[2]), l, "contrast");
        }
        float[][] f = new float[4][];
        for (int t = 0; t < 4; t++) {
            f[t] = plane(rng, kind, as, ac, sigma, l, integer);
        }
        RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(f, W2, W2, null);
        double step = integer ? 1.0 : 0.0;
        RepeatedSnrResult rs = RepeatedAcquisitions.summarize(m, RepeatedAcquisitions.Frames.of(f), SIGNAL2, l, step);
        RepeatedSnrResult rc = RepeatedAcquisitions.summarize(m, RepeatedAcquisitions.Frames.of(f), CONTRAST2, l,
                step);
        double[] s = Cnr.pooledSigma(rs.figures(), rc.figures());
        return Cnr.of(rs.signalMean(), rs.meanStandardError(), rc.signalMean(), rc.meanStandardError(), s[0],
                new Interval(s[1], s[2]), l, "contrast");
    }

    /** A contrast region brighter than the signal: a negative CNR, its interval holding the truth. */
    @Test
    void negativeCnrAndTheNoiseFloor() throws InputException {
        for (Method m : new Method[] {CnrCoverageTest::background, CnrCoverageTest::difference,
                CnrCoverageTest::repeated}) {
            double[] r = coverage(m, 2, 10, 4, 77, 2000);
            assertTrue(r[0] >= 0.93 && r[0] <= 0.97, "negative CNR coverage " + r[0]);
            assertEquals(-8, r[1], 0.1);
        }
        // a contrast region at the noise floor (A_c = 0): the warning, and an interval that reaches down to the truth
        Cnr f = background(new SplittableRandom(5), 10, 0, 8);
        assertTrue(f.warnings().stream().anyMatch(w -> w.code().equals("near_noise_floor")), f.warnings().toString());
        assertEquals(0.0, f.contrastAmplitudeCi95().low(), 0.0, "the contrast amplitude's interval stops at 0");
        double[] r = coverage(CnrCoverageTest::background, 10, 0, 8, 78, 2000);
        assertTrue(r[0] >= 0.93, "at the floor the interval is conservative, never short: " + r[0]);
        assertTrue(r[2] > 0.9, "the floor is said in most trials: " + r[2]);
    }

    /**
     * The plain CNR's bias, closed form from the noncentral-chi mean (reference sheet, section 13): for
     * L = 8 with amplitudes 10 and 2 sigma, (mean_8(10) - mean_8(2)) = 6.32 against 8; for L = 1 with 10
     * and 1 sigma, 8.50 against 9 (5.5% low).
     */
    @Test
    void plainCnrIsBiasedLow() {
        assertEquals(6.32, ChiMoments.mean(8, 10) - ChiMoments.mean(8, 2), 0.01);
        double l1 = ChiMoments.mean(1, 10) - ChiMoments.mean(1, 1);
        assertEquals(0.9446, l1 / 9, 0.0005);
    }
}
