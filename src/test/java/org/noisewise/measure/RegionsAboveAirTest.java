package org.noisewise.measure;

import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.ImagePlus;
import ij.process.FloatProcessor;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.Test;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.report.ResultRow;
import org.noisewise.sample.Phantoms;

/**
 * The cross-check of drawn background regions against the automatic air ({@code regions_above_air}),
 * by seeded simulation: on clean disk phantoms with four clean corners it is rarely raised (the
 * verdict it changes must not be wrong for clean data); with the corners holding a faint ghost-like
 * level it is raised in nearly every image.
 */
class RegionsAboveAirTest {

    static final int N = 128;

    static int raised(int channels, double ghost, long seed, int trials) throws InputException {
        List<Region> corners = new ArrayList<>();
        for (int[] c : new int[][] {{2, 2}, {102, 2}, {2, 102}, {102, 102}}) {
            corners.add(Region.rectangle("bg", c[0], c[1], 24, 24, N, N));
        }
        Region signal = Region.rectangle("signal", 49, 49, 30, 30, N, N);
        int count = 0;
        for (int t = 0; t < trials; t++) {
            float[] px = Phantoms.disk(N, N, 64, 64, 40, 120, 5, channels, seed + t);
            if (ghost > 0) {
                // a ghost-like level of 'ghost' sigma per channel over the corners' rows, added before the magnitude
                float[] g = Phantoms.disk(N, N, 64, 64, 400, ghost * 5 * Math.sqrt(channels), 5, channels,
                        seed + 100_000 + t);
                for (int i = 0; i < px.length; i++) {
                    int y = i / N;
                    if (y < 28 || y >= 100) {
                        px[i] = g[i];
                    }
                }
            }
            ImagePlus imp = new ImagePlus("disk", new FloatProcessor(N, N, px));
            Measurement m = BackgroundMeasure.run(imp, "disk", Roles.of(signal, corners),
                    new BackgroundMeasure.Options(channels, null, null), new int[] {1}, null, Progress.NONE);
            ResultRow row = m.rows().get(0);
            count += String.valueOf(row.get("warnings")).contains("regions_above_air") ? 1 : 0;
        }
        return count;
    }

    @Test
    void cleanCornersAreRarelyQuestioned() throws InputException {
        for (int l : new int[] {1, 8}) {
            int trials = 150;
            int n = raised(l, 0, 9000L * l, trials);
            System.out.printf(Locale.ROOT, "regions_above_air on clean corners, L=%d: %d of %d%n", l, n, trials);
            assertTrue(n <= 2, "false alarms " + n);
        }
    }

    @Test
    void cornersHoldingAFaintLevelAreQuestioned() throws InputException {
        int trials = 40;
        int n = raised(1, 1.5, 777, trials);
        System.out.printf(Locale.ROOT, "regions_above_air with a 1.5-sigma level over the corners, L=1: %d of %d%n", n,
                trials);
        assertTrue(n >= 0.95 * trials, "raised " + n);
    }
}
