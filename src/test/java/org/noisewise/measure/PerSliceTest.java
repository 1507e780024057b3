package org.noisewise.measure;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.ImagePlus;
import ij.ImageStack;
import ij.process.FloatProcessor;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.report.ResultRow;
import org.noisewise.sample.Phantoms;

/**
 * The slices of a hyperstack are measured on several workers at once: the rows must come in slice
 * order and hold exactly what one slice measured alone gives, an error must be the one the first
 * failing slice gives (as a loop over the slices would), and progress must only move forward.
 */
class PerSliceTest {

    private static final int W = 48;
    private static final int Z = 6;

    /** A Z x T hyperstack of disks, amplitude 200 + 40 z, sigma 10; {@code negative} slices shifted below zero. */
    private static ImagePlus hyperstack(int t, int... negative) {
        ImageStack st = new ImageStack(W, W);
        for (int f = 0; f < t; f++) {
            for (int z = 0; z < Z; z++) {
                float[] p = Phantoms.disk(W, W, W / 2.0, W / 2.0, 18, 200 + 40 * z, 10, 1, 1000L * z + f);
                for (int n : negative) {
                    if (n == z + 1) {
                        for (int i = 0; i < p.length; i++) {
                            p[i] -= 5000;
                        }
                    }
                }
                st.addSlice("z" + (z + 1) + " t" + (f + 1), new FloatProcessor(W, W, p));
            }
        }
        ImagePlus imp = new ImagePlus("slices", st);
        imp.setDimensions(1, Z, t);
        imp.setOpenAsHyperStack(true);
        return imp;
    }

    private static int[] all() {
        int[] zs = new int[Z];
        for (int i = 0; i < Z; i++) {
            zs[i] = i + 1;
        }
        return zs;
    }

    private static void assertSameRow(ResultRow expected, ResultRow actual, String where) {
        assertEquals(expected.cells().size(), actual.cells().size(), where);
        for (int i = 0; i < expected.cells().size(); i++) {
            ResultRow.Cell a = expected.cells().get(i);
            ResultRow.Cell b = actual.cells().get(i);
            assertEquals(a.key(), b.key(), where);
            assertEquals(String.valueOf(a.value()), String.valueOf(b.value()), where + " " + a.key());
        }
    }

    @Test
    void repeatedRowsComeInSliceOrderAndEqualEachSliceMeasuredAlone() throws Exception {
        ImagePlus imp = hyperstack(16);
        Roles roles = new Roles(List.of(Region.rectangle("signal", 16, 16, 16, 16, W, W)), List.of());
        List<Double> seen = new ArrayList<>();
        Measurement m = RepeatedMeasure.run(imp, "slices", roles, 1, all(), true, (f, s) -> seen.add(f));
        assertEquals(Z, m.rows().size());
        assertEquals(Z, m.images().size());
        for (int z = 1; z <= Z; z++) {
            ResultRow row = m.rows().get(z - 1);
            assertEquals(z, ((Number) row.get("slice")).intValue(), "rows in slice order");
            assertTrue(m.images().get(z - 1).getTitle().endsWith(" z" + z), m.images().get(z - 1).getTitle());
            Measurement alone = RepeatedMeasure.run(imp, "slices", roles, 1, new int[] {z}, false, Progress.NONE);
            assertSameRow(alone.rows().get(0), row, "z " + z);
        }
        // the amplitudes rise with z (200 + 40 z): the rows are not one slice's figures repeated
        assertTrue((double) m.rows().get(Z - 1).get("signal_mean") > (double) m.rows().get(0).get("signal_mean") + 150);
        for (int i = 1; i < seen.size(); i++) {
            assertTrue(seen.get(i) >= seen.get(i - 1), "progress went back: " + seen);
        }
        assertEquals(1.0, seen.get(seen.size() - 1));
    }

    @Test
    void stabilityRowsEqualEachSliceMeasuredAlone() throws Exception {
        ImagePlus imp = hyperstack(40);
        StabilityMeasure.Outcome all = StabilityMeasure.run(imp, "slices", null,
                StabilityMeasure.Options.measure(all(), 2, 12, true, true), null, Progress.NONE);
        assertEquals(Z, all.measurement().rows().size());
        assertEquals(3 * Z, all.measurement().plots().size());
        for (int z = 1; z <= Z; z++) {
            StabilityMeasure.Outcome one = StabilityMeasure.run(imp, "slices", null,
                    StabilityMeasure.Options.measure(new int[] {z}, 2, 12, false, false), null, Progress.NONE);
            assertSameRow(one.measurement().rows().get(0), all.measurement().rows().get(z - 1), "z " + z);
        }
        long squareNotes = all.measurement().notes().stream().filter(n -> n.startsWith("region: the 12x12 square"))
                .count();
        assertEquals(1, squareNotes, "the square's note once: " + all.measurement().notes());
    }

    @Test
    void theErrorIsTheFirstFailingSlices() {
        ImagePlus imp = hyperstack(20, 4, 2);
        InputException e = assertThrows(InputException.class, () -> StabilityMeasure.run(imp, "slices", null,
                StabilityMeasure.Options.measure(all(), 2, 12, false, false), null, Progress.NONE));
        assertTrue(e.getMessage().contains("z 2 of 6"), e.getMessage());
    }
}
