package org.noisewise.estimate;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import java.util.stream.IntStream;
import org.junit.jupiter.api.Test;
import org.noisewise.math.ChiMoments;
import org.noisewise.sample.Phantoms;

class RepeatedAcquisitionsTest {

    private static float[][] repeats(long seed, int k, int w, int h, double a, double sigma) {
        SplittableRandom rng = new SplittableRandom(seed);
        float[][] f = new float[k][w * h];
        for (int t = 0; t < k; t++) {
            for (int i = 0; i < w * h; i++) {
                f[t][i] = (float) Phantoms.magnitude(rng, a, sigma, 1);
            }
        }
        return f;
    }

    /** Maps follow their definitions (two-pass mean and n-1 SD) on a tiny example. */
    @Test
    void mapsMatchTwoPassFormulas() throws InputException {
        float[][] f = {{1, 10}, {2, 10}, {4, 13}};
        RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(f, 2, 1, null);
        assertArrayEquals(new float[] {7f / 3, 11f}, m.mean(), 1e-6f);
        double sd0 = Math.sqrt(((1 - 7.0 / 3) * (1 - 7.0 / 3) + (2 - 7.0 / 3) * (2 - 7.0 / 3) + (4 - 7.0 / 3) * (4 - 7.0 / 3)) / 2);
        assertEquals(sd0, m.sd()[0], 1e-6);
        assertEquals(Math.sqrt(3.0), m.sd()[1], 1e-6);
        assertEquals(11 / Math.sqrt(3.0), m.snr()[1], 1e-5);
    }

    /** b(K) = sqrt((K-1)/2) Gamma((K-2)/2)/Gamma((K-1)/2): K = 3 gives sqrt(pi) (closed form), K = 16 about 1.0537. */
    @Test
    void snrMapBiasFactor() {
        assertEquals(Math.sqrt(Math.PI), RepeatedAcquisitions.snrMapBias(3), 1e-12);
        // K = 5: sqrt(2) Gamma(1.5)/Gamma(2) = sqrt(2) * sqrt(pi)/2 (closed form)
        assertEquals(Math.sqrt(2) * Math.sqrt(Math.PI) / 2, RepeatedAcquisitions.snrMapBias(5), 1e-12);
        assertEquals(Double.POSITIVE_INFINITY, RepeatedAcquisitions.snrMapBias(2));
        assertEquals(1.0537, RepeatedAcquisitions.snrMapBias(16), 1e-4);
    }

    /**
     * Issue acceptance: K = 16, pooled sigma unbiased within 2% (averaged over seeds) and the region
     * summary matches the truth; the SNR map's own mean is high by b(16).
     */
    @Test
    void pooledSigmaUnbiasedAndSummaryMatchesTruth() throws InputException {
        double sigma = 4.0;
        double a = 80.0;
        Region region = new Region("signal", IntStream.range(0, 400).toArray());
        double sigmaSum = 0;
        double plainSum = 0;
        double snrSum = 0;
        double mapSum = 0;
        int trials = 20;
        for (int t = 0; t < trials; t++) {
            float[][] f = repeats(100 + t, 16, 20, 20, a, sigma);
            RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(f, 20, 20, null);
            RepeatedSnrResult r = RepeatedAcquisitions.summarize(m, RepeatedAcquisitions.Frames.of(f), region, 1);
            sigmaSum += r.sigmaMagnitude();
            plainSum += r.magnitudeSnr();
            snrSum += r.snr();
            mapSum += r.snrMapMean();
            assertTrue(r.sigmaCi95().width() > 0);
        }
        // at A/sigma = 20 the magnitude SD is 0.99875 sigma and the mean 20.025 sigma (Rice, closed form)
        double sdRice = sigma * Math.sqrt(ChiMoments.variance(1, a / sigma));
        double snrRice = ChiMoments.mean(1, a / sigma) / Math.sqrt(ChiMoments.variance(1, a / sigma));
        assertEquals(sdRice, sigmaSum / trials, 0.003 * sigma);
        assertEquals(snrRice, plainSum / trials, 0.01 * snrRice);
        // the corrected SNR is the true A / sigma = 20 (the plain ratio's 0.2% bias removed)
        assertEquals(a / sigma, snrSum / trials, 0.005 * a / sigma);
        assertEquals(RepeatedAcquisitions.snrMapBias(16) * snrRice, mapSum / trials, 0.01 * snrRice);
    }

    /** A/sigma = 2, 64 repeats: the magnitude mean is about 14% high, the corrected figures within 5% of the truth. */
    @Test
    void ricianCorrectionAtLowSnr() throws InputException {
        double sigma = 10.0;
        double a = 20.0;
        float[][] f = repeats(64, 64, 16, 16, a, sigma);
        RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(f, 16, 16, null);
        Region region = new Region("signal", IntStream.range(0, 256).toArray());
        RepeatedSnrResult r = RepeatedAcquisitions.summarize(m, RepeatedAcquisitions.Frames.of(f), region, 1);
        // Rice mean at theta = 2 is 2.2723834 (references.md section 2): 13.6% high
        assertEquals(1.136, r.signalMean() / a, 0.02);
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("low_snr")));
        assertEquals(a, r.figures().amplitude(), 0.05 * a);
        assertEquals(sigma, r.sigma(), 0.05 * sigma);
        assertEquals(2.0, r.snr(), 0.1);
        assertTrue(r.snrCi95().contains(2.0), r.snrCi95().toString());
    }

    /** A pixel constant over the repeats gets a warning, not a false "NaN pixels" error (issue 15.6). */
    @Test
    void constantPixelIsAWarning() throws InputException {
        float[][] f = repeats(5, 10, 10, 10, 50, 5);
        for (float[] frame : f) {
            frame[17] = 42f;
        }
        RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(f, 10, 10, null);
        RepeatedSnrResult r = RepeatedAcquisitions.summarize(m, RepeatedAcquisitions.Frames.of(f),
                new Region("signal", IntStream.range(0, 100).toArray()), 1);
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("constant_pixels")
                && w.message().contains("1 pixel")), r.warnings().toString());
        assertTrue(Double.isFinite(r.snrMapMean()));
    }

    @Test
    void parallelMapsAreDeterministicAndProgressReachesOne() throws InputException {
        float[][] f = repeats(7, 5, 64, 48, 30, 3);
        double[] last = {0};
        RepeatedAcquisitions.Maps m1 = RepeatedAcquisitions.maps(f, 64, 48, p -> last[0] = Math.max(last[0], p));
        RepeatedAcquisitions.Maps m2 = RepeatedAcquisitions.maps(f, 64, 48, null);
        assertArrayEquals(m1.sd(), m2.sd());
        assertEquals(1.0, last[0]);
    }

    @Test
    void badInput() {
        assertThrows(InputException.class, () -> RepeatedAcquisitions.maps(new float[][] {{1, 2}}, 2, 1, null));
        assertThrows(InputException.class, () -> RepeatedAcquisitions.maps(new float[][] {{1, 2}, {1}}, 2, 1, null));
    }

    /**
     * Issue 10: on 16-bit data such as 30000 +- 2 the SD map agrees with a two-pass computation to 1e-6
     * relative (the shifted sums are exact for integer data; a naive sum of squares would lose about
     * nine of its sixteen digits here).
     */
    @Test
    void storedShortFramesAreNumericallyStable() throws InputException {
        int k = 100;
        int n = 5000;
        SplittableRandom rng = new SplittableRandom(30000);
        short[][] frames = new short[k][n];
        for (short[] f : frames) {
            for (int i = 0; i < n; i++) {
                f[i] = (short) (30000 + rng.nextInt(5) - 2);
            }
        }
        RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(frames, n, 1, 0.0, 1.0, null, null);
        for (int i = 0; i < n; i++) {
            double mean = 0;
            for (short[] f : frames) {
                mean += f[i] & 0xffff;
            }
            mean /= k;
            double ss = 0;
            for (short[] f : frames) {
                double d = (f[i] & 0xffff) - mean;
                ss += d * d;
            }
            double sd = Math.sqrt(ss / (k - 1));
            assertEquals(sd, m.sd()[i], 1e-6 * sd, "pixel " + i);
            assertEquals(mean, m.mean()[i], 1e-6 * mean);
        }
    }

    /** Stored frames with a linear or tabulated calibration give the maps of their calibrated values. */
    @Test
    void storedFramesWithCalibrationMatchCalibratedFloats() throws InputException {
        int k = 7;
        int n = 3000;
        SplittableRandom rng = new SplittableRandom(4);
        short[][] raw = new short[k][n];
        byte[][] bytes = new byte[k][n];
        float[] table = new float[65536];
        for (int v = 0; v < table.length; v++) {
            table[v] = (float) Math.sqrt(v);
        }
        float[][] linear = new float[k][n];
        float[][] tabulated = new float[k][n];
        float[][] byteValues = new float[k][n];
        for (int f = 0; f < k; f++) {
            for (int i = 0; i < n; i++) {
                raw[f][i] = (short) (1000 + rng.nextInt(400));
                bytes[f][i] = (byte) (100 + rng.nextInt(50));
                linear[f][i] = (float) (-500 + 2.5 * (raw[f][i] & 0xffff));
                tabulated[f][i] = table[raw[f][i] & 0xffff];
                byteValues[f][i] = bytes[f][i] & 0xff;
            }
        }
        RepeatedAcquisitions.Maps a = RepeatedAcquisitions.maps(raw, n, 1, -500, 2.5, null, null);
        RepeatedAcquisitions.Maps b = RepeatedAcquisitions.maps(linear, n, 1, null);
        RepeatedAcquisitions.Maps c = RepeatedAcquisitions.maps(raw, n, 1, 0, 1, table, null);
        RepeatedAcquisitions.Maps d = RepeatedAcquisitions.maps(tabulated, n, 1, null);
        RepeatedAcquisitions.Maps e = RepeatedAcquisitions.maps(bytes, n, 1, 0, 1, null, null);
        RepeatedAcquisitions.Maps g = RepeatedAcquisitions.maps(byteValues, n, 1, null);
        assertArrayEquals(b.mean(), a.mean(), 1e-3f);
        assertArrayEquals(b.sd(), a.sd(), 1e-3f);
        assertArrayEquals(d.sd(), c.sd(), 1e-4f);
        assertArrayEquals(g.sd(), e.sd(), 1e-5f);
    }
}
