package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.noisewise.sample.Phantoms;

class SnrMathTest {

    /** references.md section 2: the Rice mean at theta = 2 is 2.2723834 [math], so the inversion gives 2. */
    @Test
    void invertsTheRiceMean() {
        assertEquals(2.0, SnrMath.trueSnrFromMagnitudeMean(2.2723834, 1), 1e-6);
        assertEquals(1.0, SnrMath.trueSnrFromMagnitudeMean(1.5485725, 1), 1e-6);
        assertEquals(0.0, SnrMath.trueSnrFromMagnitudeMean(1.2, 1), 0.0);
        // L = 4, theta = 2: mean 3.36818 (references.md section 3, from memory, checked by Monte Carlo)
        assertEquals(2.0, SnrMath.trueSnrFromMagnitudeMean(3.36818, 4), 1e-4);
    }

    /** The low-SNR warning states the bias of the magnitude mean: 13.6% at theta = 2 (2.2723834 / 2). */
    @Test
    void lowSnrWarningQuantifiesBias() {
        Warning w = SnrMath.lowSnrWarning(2.2723834, 1);
        assertNotNull(w);
        assertEquals("low_snr", w.code());
        assertTrue(w.message().contains("about 14%"), w.message());
        assertTrue(w.message().contains("Rician"), w.message());
        assertNull(SnrMath.lowSnrWarning(4.0, 1));
        assertNull(SnrMath.lowSnrWarning(25, 8));
        Warning floor = SnrMath.lowSnrWarning(1.1, 1);
        assertTrue(floor.message().contains("cannot be told from noise"), floor.message());
    }

    /** The SNR interval covers the truth in about 95% of seeded trials (signal 900 px, background 2,000 px). */
    @Test
    void snrIntervalCoverage() throws InputException {
        int trials = 400;
        int covered = 0;
        double sum = 0;
        SplittableRandom rng = new SplittableRandom(11);
        double sigma = 3.0;
        double amplitude = 60.0;
        // at A/sigma = 20 the magnitude mean is sigma * mean(20) (Rice closed form)
        double expectedSnr = org.noisewise.math.ChiMoments.riceMean(amplitude / sigma);
        for (int t = 0; t < trials; t++) {
            float[] px = new float[2900];
            for (int i = 0; i < px.length; i++) {
                px[i] = (float) Phantoms.magnitude(rng, i < 900 ? amplitude : 0, sigma, 1);
            }
            Region s = new Region("signal", java.util.stream.IntStream.range(0, 900).toArray());
            Region b = new Region("bg", java.util.stream.IntStream.range(900, 2900).toArray());
            BackgroundSnrResult r = BackgroundSnr.analyze(px, px.length, 1, s, List.of(b), BackgroundSnr.Options.defaults());
            covered += r.snrCi95().contains(expectedSnr) ? 1 : 0;
            sum += r.snr();
        }
        assertEquals(expectedSnr, sum / trials, 0.005 * expectedSnr);
        double coverage = (double) covered / trials;
        assertTrue(coverage >= 0.93 && coverage <= 0.97, "coverage " + coverage);
    }
}
