package org.noisewise.protocol;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Interval;
import org.noisewise.estimate.Levels;

/**
 * How SNR scales between protocols: {@code SNR ~ V sqrt(T) B0^p / (g sqrt(R))} with V the voxel volume,
 * T = phase x partitions x averages / bandwidth the full sampling time, B0 the field and p its exponent
 * (Edelstein et al. 1986, MRM 3:604; Parker and Gullberg 1990, Med Phys 17:250; p = 1 by default, about
 * 1.94 in phantoms at 3-11.7 T by Le Ster et al. 2022, MRM 88:2131), and parallel imaging dividing SNR
 * by {@code g sqrt(R)} (Pruessmann et al. 1999, MRM 42:952).
 */
public final class ProtocolScaling {

    /** The default field exponent. */
    public static final double DEFAULT_FIELD_EXPONENT = 1.0;

    private ProtocolScaling() {
    }

    /**
     * A predicted ratio {@code SNR_to / SNR_from}, its factors (each parameter's contribution, product =
     * ratio) and notes on parameters given for neither protocol (taken as equal, and said so).
     */
    public record Prediction(double ratio, Map<String, Double> factors, double fieldExponent, List<String> notes) {
        public Prediction {
            factors = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(factors));
            notes = List.copyOf(notes);
        }
    }

    /**
     * The predicted SNR ratio of {@code to} against {@code from}. A parameter stated for one protocol only
     * is an input error naming it; one stated for neither is taken as equal, with a note.
     */
    public static Prediction predict(Protocol from, Protocol to, double fieldExponent) throws InputException {
        if (!(fieldExponent >= 0) || !Double.isFinite(fieldExponent)) {
            throw new InputException("the field exponent must be a number of 0 or more (1 by default; about 2 in "
                    + "phantoms at high field)");
        }
        List<String> notes = new ArrayList<>();
        Map<String, Double> f = new LinkedHashMap<>();
        f.put("voxel_volume", ratio(from, to, "voxel", notes));
        double t = ratio(from, to, "phase", notes) * ratio(from, to, "averages", notes)
                / ratio(from, to, "bandwidth", notes);
        // partitions: 1 for a 2-D acquisition; a 3-D slab's must be known (a slice carries the slab's sampling time)
        Double pa = from.partitions() != null ? from.partitions() : from.slab() ? null : Double.valueOf(1.0);
        Double pb = to.partitions() != null ? to.partitions() : to.slab() ? null : Double.valueOf(1.0);
        if (pa == null && pb == null) {
            notes.add("the number of partitions of neither 3-D acquisition is known: taken as equal (factor 1)");
        } else if (pa == null || pb == null) {
            throw new InputException("the " + (pa == null ? "first (A)" : "second (B)") + " protocol is a 3-D "
                    + "acquisition whose number of partitions is not known (each slice carries the whole slab's "
                    + "sampling time): add partitions=N to it, or give the whole volume");
        } else {
            t *= pb / pa;
        }
        f.put("sampling_time", Math.sqrt(t));
        f.put("field", Math.pow(ratio(from, to, "field", notes), fieldExponent));
        double accFrom = Protocol.orOne(from.g()) * Math.sqrt(Protocol.orOne(from.acceleration()));
        double accTo = Protocol.orOne(to.g()) * Math.sqrt(Protocol.orOne(to.acceleration()));
        f.put("acceleration", accFrom / accTo);
        double r = 1.0;
        for (double v : f.values()) {
            r *= v;
        }
        return new Prediction(r, f, fieldExponent, notes);
    }

    /** {@code to / from} of one key; 1 with a note when neither states it; an error when one does. */
    private static double ratio(Protocol from, Protocol to, String key, List<String> notes) throws InputException {
        Double a = from.value(key);
        Double b = to.value(key);
        if (a == null && b == null) {
            notes.add(name(key) + " given for neither protocol: taken as equal (factor 1)");
            return 1.0;
        }
        if (a == null || b == null) {
            throw new InputException(name(key) + " (" + key + ") is known for the " + (a == null ? "second" : "first")
                    + " protocol but not for the " + (a == null ? "first" : "second") + ": add " + key + "=... to the "
                    + (a == null ? "first (A)" : "second (B)") + " protocol");
        }
        return b / a;
    }

    private static String name(String key) {
        return switch (key) {
            case "voxel" -> "the voxel size";
            case "phase" -> "the phase-encoding steps";
            case "averages" -> "the number of averages";
            case "bandwidth" -> "the bandwidth per pixel";
            case "field" -> "the field strength";
            case "partitions" -> "the number of partitions";
            default -> key;
        };
    }

    /** SNR efficiency and its interval, in mm^-3 s^-1/2. */
    public record Efficiency(double value, Interval ci95) {
    }

    /**
     * SNR efficiency {@code SNR / (V sqrt(T))}, V in mm^3 and T the sampling time actually spent in s
     * (the full time over R, so an accelerated protocol's efficiency is lower by its g-factor); null when
     * the protocol lacks a needed parameter ({@link Protocol#missingForEfficiency()}) or the SNR is not finite.
     */
    public static Efficiency efficiency(double snr, Interval snrCi, Protocol p) {
        if (p == null || !p.missingForEfficiency().isEmpty() || !Double.isFinite(snr)) {
            return null;
        }
        double k = 1.0 / (p.volume() * Math.sqrt(p.samplingTime()));
        Interval ci = snrCi == null ? new Interval(Double.NaN, Double.NaN)
                : new Interval(snrCi.low() * k, snrCi.high() * k);
        return new Efficiency(snr * k, ci);
    }

    /** A measured ratio {@code SNR_b / SNR_a} with a 95% interval, and whether a prediction lies inside it. */
    public record MeasuredRatio(double ratio, Interval ci95, Double predicted, Boolean consistent) {
    }

    /**
     * The ratio of two corrected SNRs; the interval is log-normal with the two log standard errors read
     * from the SNR intervals added in quadrature (independent acquisitions).
     */
    public static MeasuredRatio measuredRatio(CorrectedSnr a, CorrectedSnr b, Double predicted) {
        double r = b.snr() / a.snr();
        double se = Math.hypot(CorrectedSnr.logSe(a.snrCi95()), CorrectedSnr.logSe(b.snrCi95()));
        Interval ci = Double.isFinite(se) && r > 0
                ? new Interval(r * Math.exp(-Levels.Z95 * se), r * Math.exp(Levels.Z95 * se))
                : new Interval(Double.NaN, Double.NaN);
        Boolean consistent = predicted == null || !Double.isFinite(ci.low()) ? null : ci.contains(predicted);
        return new MeasuredRatio(r, ci, predicted, consistent);
    }
}
