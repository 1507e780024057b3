package org.noisewise.math;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.math.BigDecimal;
import java.math.MathContext;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.ValueSource;

class ScaledBesselTest {

    private static final MathContext MC = new MathContext(45);

    /** references.md section 7: values [math, mpmath] in the layout of Abramowitz and Stegun Table 9.8. */
    @ParameterizedTest
    @CsvSource({
        "0.5, 0.6450352704, 0.1564208032",
        "1,   0.4657596076, 0.2079104153",
        "2,   0.3085083226, 0.2152692892",
        "5,   0.1835408126, 0.1639722669",
        "10,  0.1278333372, 0.1212626814",
        "20,  0.0897803119, 0.0875062222"})
    void matchesReferenceTable(double x, double i0e, double i1e) {
        // table values carry 10 decimals
        assertEquals(i0e, ScaledBessel.i0e(x), 6e-11);
        assertEquals(i1e, ScaledBessel.i1e(x), 6e-11);
    }

    /** references.md section 7: unscaled I0(10) = 2815.7166285, I1(20) = 4.2454973385e7 [math]. */
    @Test
    void unscaledValuesFromTable() {
        assertEquals(2815.7166285, ScaledBessel.i0e(10) * Math.exp(10), 1e-6);
        assertEquals(4.3558282560e7, ScaledBessel.i0e(20) * Math.exp(20), 1e-2);
        assertEquals(4.2454973385e7, ScaledBessel.i1e(20) * Math.exp(20), 1e-2);
    }

    /**
     * Ascending series (A&S 9.6.10) evaluated to 45 significant digits with BigDecimal, times e^-x
     * from a 45-digit exponential series: 1e-12 relative over 0 to 700, including both branches
     * and the switch at 30.
     */
    @ParameterizedTest
    @ValueSource(doubles = {0, 1e-8, 0.01, 0.3, 1, 3.7, 9, 15, 22.5, 29.999, 30, 30.001, 45, 80, 150, 300, 512.25, 700})
    void agreesWithHighPrecisionSeries(double x) {
        for (int n = 0; n <= 1; n++) {
            double reference = highPrecision(n, x);
            double got = n == 0 ? ScaledBessel.i0e(x) : ScaledBessel.i1e(x);
            if (reference == 0) {
                assertEquals(0.0, got, 0.0);
            } else {
                assertEquals(1.0, got / reference, 1e-12, "n=" + n + " x=" + x);
            }
        }
    }

    @Test
    void noOverflowFarOut() {
        double x = 1e6;
        double v = ScaledBessel.i0e(x);
        assertTrue(Double.isFinite(v));
        // leading asymptotic term 1/sqrt(2 pi x) with first correction 1/(8x)
        assertEquals(1.0 / Math.sqrt(2 * Math.PI * x) * (1 + 1 / (8 * x)), v, 1e-15);
    }

    @Test
    void rejectsNegativeAndNaN() {
        assertThrows(IllegalArgumentException.class, () -> ScaledBessel.i0e(-1));
        assertThrows(IllegalArgumentException.class, () -> ScaledBessel.i1e(Double.NaN));
    }

    static double highPrecision(int n, double xd) {
        BigDecimal x = new BigDecimal(xd);
        BigDecimal half = x.divide(BigDecimal.valueOf(2), MC);
        BigDecimal q = half.multiply(half, MC);
        BigDecimal term = n == 0 ? BigDecimal.ONE : half;
        BigDecimal sum = term;
        for (int k = 1; k < 5000; k++) {
            term = term.multiply(q, MC).divide(BigDecimal.valueOf((long) k * (k + n)), MC);
            sum = sum.add(term, MC);
            if (term.signum() == 0 || term.compareTo(sum.movePointLeft(50)) < 0) {
                break;
            }
        }
        BigDecimal expX = BigDecimal.ONE;
        BigDecimal t = BigDecimal.ONE;
        for (int k = 1; k < 10000; k++) {
            t = t.multiply(x, MC).divide(BigDecimal.valueOf(k), MC);
            expX = expX.add(t, MC);
            if (t.signum() == 0 || t.compareTo(expX.movePointLeft(50)) < 0) {
                break;
            }
        }
        return sum.divide(expX, MC).doubleValue();
    }
}
