package org.noisewise.protocol;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.DifferenceSnr;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Interval;
import org.noisewise.estimate.Region;
import org.noisewise.testing.NoiseFields;

/** SNR scaling between protocols, SNR efficiency and the measured ratio's interval. */
class ProtocolScalingTest {

    private static Protocol p(String s) throws InputException {
        return Protocol.parse(s, "test");
    }

    private static double ratio(String from, String to) throws InputException {
        return ProtocolScaling.predict(p(from), p(to), 1.0).ratio();
    }

    /** Reference sheet section 6, check value [math]: 1x1x5, 256, NEX 1, 130 Hz/px against 1x1x3, 256, NEX 2, 260 -> 0.6. */
    @Test
    void referenceCheckValue() throws InputException {
        ProtocolScaling.Prediction pr = ProtocolScaling.predict(
                p("voxel=1x1x5,phase=256,averages=1,bandwidth=130,field=3"),
                p("voxel=1x1x3,phase=256,averages=2,bandwidth=260,field=3"), 1.0);
        assertEquals(0.6, pr.ratio(), 1e-12);
        assertEquals(0.6, pr.factors().get("voxel_volume"), 1e-12);
        assertEquals(1.0, pr.factors().get("sampling_time"), 1e-12);
        assertEquals(1.0, pr.factors().get("field"), 1e-12);
        assertEquals(1.0, pr.factors().get("acceleration"), 1e-12);
        assertTrue(pr.notes().isEmpty(), pr.notes().toString());
    }

    /** Closed forms of SNR ~ V sqrt(phase x partitions x NEX / BW) B0^p / (g sqrt(R)) (Edelstein et al. 1986; Pruessmann et al. 1999). */
    @Test
    void closedFormFactors() throws InputException {
        String base = "voxel=1x1x1,phase=256,averages=1,bandwidth=200,field=3";
        // 3-D: twice the partitions doubles the sampling time -> sqrt(2)
        assertEquals(Math.sqrt(2), ratio(base + ",partitions=32", base + ",partitions=64"), 1e-12);
        // partitions default to 1
        assertEquals(Math.sqrt(64), ratio(base, base + ",partitions=64"), 1e-12);
        // four averages -> 2
        assertEquals(2.0, ratio(base, base.replace("averages=1", "averages=4")), 1e-12);
        // twice the bandwidth -> 1/sqrt(2)
        assertEquals(1 / Math.sqrt(2), ratio(base, base.replace("bandwidth=200", "bandwidth=400")), 1e-12);
        // field 1.5 T -> 3 T: 2 with p = 1, 2^1.94 with p = 1.94 (Le Ster et al. 2022)
        String f15 = base.replace("field=3", "field=1.5");
        assertEquals(2.0, ratio(f15, base), 1e-12);
        assertEquals(Math.pow(2, 1.94), ProtocolScaling.predict(p(f15), p(base), 1.94).ratio(), 1e-12);
        // acceleration R = 2 with g = 1.2 -> 1 / (1.2 sqrt 2)
        assertEquals(1 / (1.2 * Math.sqrt(2)), ratio(base, base + ",acceleration=2,g=1.2"), 1e-12);
        // voxel 2x2x4 against 1x1x1 -> 16
        assertEquals(16.0, ratio(base, base.replace("voxel=1x1x1", "voxel=2x2x4")), 1e-12);
        // the factors multiply to the ratio
        ProtocolScaling.Prediction pr = ProtocolScaling.predict(p(base),
                p("voxel=0.8x0.8x2,phase=320,partitions=1,averages=2,bandwidth=250,field=1.5,acceleration=3,g=1.1"), 1.0);
        double product = pr.factors().values().stream().mapToDouble(Double::doubleValue).reduce(1, (x, y) -> x * y);
        assertEquals(pr.ratio(), product, 1e-12);
        double expected = (0.8 * 0.8 * 2) * Math.sqrt(320.0 * 2 / 250 / (256.0 / 200)) * 0.5 / (1.1 * Math.sqrt(3));
        assertEquals(expected, pr.ratio(), 1e-12);
    }

    @Test
    void missingParametersAreNamed() throws InputException {
        InputException e = assertThrows(InputException.class, () -> ProtocolScaling.predict(
                p("voxel=1x1x5,phase=256,averages=1,bandwidth=130,field=3"),
                p("voxel=1x1x3,phase=256,averages=2,bandwidth=260"), 1.0));
        assertTrue(e.getMessage().contains("field strength") && e.getMessage().contains("field=")
                && e.getMessage().contains("second (B)"), e.getMessage());
        e = assertThrows(InputException.class, () -> ProtocolScaling.predict(p("phase=256,averages=1,bandwidth=130"),
                p("voxel=1x1x3,phase=256,averages=2,bandwidth=260"), 1.0));
        assertTrue(e.getMessage().contains("voxel") && e.getMessage().contains("first (A)"), e.getMessage());
        ProtocolScaling.Prediction pr = ProtocolScaling.predict(p("voxel=1x1x5,phase=256,averages=1,bandwidth=130"),
                p("voxel=1x1x3,phase=256,averages=2,bandwidth=260"), 1.0);
        assertEquals(1, pr.notes().size());
        assertTrue(pr.notes().get(0).contains("neither") && pr.notes().get(0).contains("field"), pr.notes().toString());
    }

    @Test
    void parseRefusesWhatItCannotRead() {
        for (String bad : new String[] {"", "voxel=1x1", "phase=-3", "nex=2", "phase=abc", "phase", "g=0.5",
                "acceleration=0.9", "phase=2,phase=3", "field=NaN"}) {
            InputException e = assertThrows(InputException.class, () -> Protocol.parse(bad, "--from"), bad);
            assertTrue(e.getMessage().startsWith("--from"), e.getMessage());
        }
    }

    @Test
    void parseAndText() throws InputException {
        Protocol a = p("voxel=1x1x5; phase=256 averages=1,bandwidth=130.5,FIELD=3");
        assertEquals(5.0, a.volume(), 1e-12);
        assertEquals("voxel=1x1x5,phase=256,averages=1,bandwidth=130.5,field=3", a.text());
        assertEquals(256 * 1 / 130.5, a.samplingTime(), 1e-12);
        assertNull(a.acceleration());
    }

    /** SNR efficiency = SNR / (V sqrt(T)), T = phase x partitions x NEX / (BW x R) [closed form]. */
    @Test
    void efficiency() throws InputException {
        Protocol a = p("voxel=1x1x5,phase=256,averages=2,bandwidth=128");
        ProtocolScaling.Efficiency e = ProtocolScaling.efficiency(40, new Interval(38, 42), a);
        double t = 256.0 * 2 / 128; // 4 s
        assertEquals(40 / (5 * Math.sqrt(t)), e.value(), 1e-12);
        assertEquals(38 / (5 * Math.sqrt(t)), e.ci95().low(), 1e-12);
        // an accelerated protocol samples T/R: with SNR lower by g sqrt(R) the efficiency is lower by g
        Protocol acc = p("voxel=1x1x5,phase=256,averages=2,bandwidth=128,acceleration=2,g=1.25");
        double snrAcc = 40 / (1.25 * Math.sqrt(2));
        assertEquals(e.value() / 1.25, ProtocolScaling.efficiency(snrAcc, new Interval(1, 2), acc).value(), 1e-12);
        assertNull(ProtocolScaling.efficiency(40, new Interval(38, 42), p("voxel=1x1x5,phase=256,averages=2")));
    }

    /**
     * The measured ratio's interval contains the TRUE ratio of A/sigma in 93-97% of 600 seeded trials
     * (difference method on both protocols, true SNR 20 and 12; band about 3 binomial SDs, common practice).
     */
    @Test
    void measuredRatioIntervalCoversTheTrueRatio() throws InputException {
        SplittableRandom rng = new SplittableRandom(20261202);
        int w = 48;
        Region reg = Region.rectangle("signal", 9, 9, 30, 30, w, w);
        double sigma = 5;
        double aA = 100;
        double aB = 60;
        double truth = (aB / sigma) / (aA / sigma);
        int trials = 600;
        int inside = 0;
        for (int t = 0; t < trials; t++) {
            CorrectedSnr sa = pair(rng, w, aA, sigma, reg);
            CorrectedSnr sb = pair(rng, w, aB, sigma, reg);
            ProtocolScaling.MeasuredRatio m = ProtocolScaling.measuredRatio(sa, sb, 0.6);
            if (m.ci95().contains(truth)) {
                inside++;
            }
        }
        double coverage = (double) inside / trials;
        System.out.printf(java.util.Locale.ROOT, "coverage %% of the true SNR ratio: %.1f%n", 100 * coverage);
        assertTrue(coverage >= 0.93 && coverage <= 0.97, "coverage " + coverage);
    }

    private static CorrectedSnr pair(SplittableRandom rng, int w, double a, double sigma, Region reg) {
        float[] x = new float[w * w];
        float[] y = new float[w * w];
        for (int i = 0; i < x.length; i++) {
            x[i] = (float) NoiseFields.magnitude(rng, a, sigma, 1);
            y[i] = (float) NoiseFields.magnitude(rng, a, sigma, 1);
        }
        try {
            return DifferenceSnr.analyze(x, y, w, reg, 1).figures();
        } catch (InputException e) {
            throw new AssertionError(e);
        }
    }
}
