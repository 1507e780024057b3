package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

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

    /**
     * The low-SNR warning compares the plain ratio with the corrected SNR: at theta = 2 the Rice mean
     * is 2.2723834 (references.md section 2, series evaluated to 30 digits), 13.6% high.
     */
    @Test
    void lowSnrWarningQuantifiesBias() {
        Warning w = SnrMath.lowSnrWarning(2.0, 2.2723834, 1);
        assertNotNull(w);
        assertEquals("low_snr", w.code());
        assertTrue(w.message().contains("+14%"), w.message());
        assertTrue(w.message().contains("Rice model"), w.message());
        assertNull(SnrMath.lowSnrWarning(4.0, 4.1, 1));
        Warning floor = SnrMath.lowSnrWarning(0.0, 1.1, 1);
        assertTrue(floor.message().contains("cannot be told from noise"), floor.message());
    }

    /**
     * The threshold follows the channel count: the bias at SNR 4 for one channel (mean_1(4)/4 - 1,
     * closed form) is kept for L channels, where the noise floor beta_L is higher (references.md
     * section 3: 1.25 sigma for L = 1, 3.94 sigma for L = 8), so the rule reaches higher SNR.
     */
    @Test
    void lowSnrLimitIsKeyedOnTheChannelCount() {
        double bias = SnrMath.lowSnrBias();
        assertEquals(org.noisewise.math.ChiMoments.riceMean(4) / 4 - 1, bias, 1e-15);
        assertEquals(4.0, SnrMath.lowSnrLimit(1), 0.0);
        for (int l : new int[] {2, 4, 8, 16}) {
            double t = SnrMath.lowSnrLimit(l);
            assertEquals(bias, org.noisewise.math.ChiMoments.mean(l, t) / t - 1, 1e-9, "L = " + l);
            assertTrue(t > SnrMath.lowSnrLimit(l / 2 == 0 ? 1 : l / 2), "rises with L");
        }
        // the large-SNR form mean ~ theta + (2L - 1)/(2 theta) puts L = 8 near sqrt(15 / (2 bias)) (closed form)
        assertEquals(Math.sqrt(15 / (2 * bias)), SnrMath.lowSnrLimit(8), 0.5);
        assertNotNull(SnrMath.lowSnrWarning(10, 10.7, 8), "SNR 10 with 8 channels is low");
        assertNull(SnrMath.lowSnrWarning(10, 10.05, 1), "SNR 10 with one channel is not");
    }
}
