package org.noisewise.protocol;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.noisewise.estimate.InputException;

/**
 * The acquisition parameters that set SNR, each {@code null} when not known.
 *
 * <p>Keys of the {@code KEY=VALUE} form ({@link #parse}): {@code voxel} (mm, {@code 1x1x5}), {@code phase}
 * (phase-encoding steps of the full k-space), {@code partitions} (3-D; default 1), {@code averages},
 * {@code bandwidth} (Hz per pixel), {@code field} (T), {@code acceleration} (R; default 1), {@code g}
 * (default 1). The sampling time of a full acquisition is {@code phase x partitions x averages / bandwidth}
 * (Edelstein et al. 1986; Parker and Gullberg 1990); an acceleration R samples 1/R of it.
 *
 * @param voxel        voxel sides in mm (x, y, z), or null
 * @param phase        phase-encoding steps
 * @param partitions   3-D partitions (1 for 2-D)
 * @param averages     averages (NEX)
 * @param bandwidth    receiver bandwidth per pixel, Hz
 * @param field        main field, T
 * @param acceleration parallel-imaging acceleration R
 * @param g            g-factor
 * @param notes        where each value came from, when not stated by the user
 * @param slab         a 3-D acquisition: its partitions must be known for the sampling time (never taken as 1)
 */
public record Protocol(double[] voxel, Double phase, Double partitions, Double averages, Double bandwidth,
                       Double field, Double acceleration, Double g, List<String> notes, boolean slab) {

    /** The keys, in the order they are written. */
    public static final List<String> KEYS = List.of("voxel", "phase", "partitions", "averages", "bandwidth", "field",
            "acceleration", "g");

    public Protocol {
        voxel = voxel == null ? null : voxel.clone();
        notes = List.copyOf(notes);
    }

    /** A protocol that is not known to be a 3-D slab (unknown partitions count as 1). */
    public Protocol(double[] voxel, Double phase, Double partitions, Double averages, Double bandwidth, Double field,
                    Double acceleration, Double g, List<String> notes) {
        this(voxel, phase, partitions, averages, bandwidth, field, acceleration, g, notes, false);
    }

    @Override
    public double[] voxel() {
        return voxel == null ? null : voxel.clone();
    }

    /** Voxel volume in mm^3, or null. */
    public Double volume() {
        return voxel == null ? null : voxel[0] * voxel[1] * voxel[2];
    }

    /** Sampling time of the full (unaccelerated) acquisition in s, or null when a part is unknown. */
    public Double fullSamplingTime() {
        if (phase == null || averages == null || bandwidth == null || slab && partitions == null) {
            return null;
        }
        return phase * orOne(partitions) * averages / bandwidth;
    }

    /** Sampling time actually spent, the full time over R, in s, or null. */
    public Double samplingTime() {
        Double t = fullSamplingTime();
        return t == null ? null : t / orOne(acceleration);
    }

    /** The keys needed for the SNR efficiency that this protocol lacks. */
    public List<String> missingForEfficiency() {
        List<String> m = new ArrayList<>();
        if (voxel == null) {
            m.add("voxel");
        }
        if (phase == null) {
            m.add("phase");
        }
        if (averages == null) {
            m.add("averages");
        }
        if (bandwidth == null) {
            m.add("bandwidth");
        }
        if (slab && partitions == null) {
            m.add("partitions");
        }
        return m;
    }

    static double orOne(Double v) {
        return v == null ? 1.0 : v;
    }

    /** The value of a key (voxel volume for {@code voxel}), or null. */
    public Double value(String key) {
        return switch (key) {
            case "voxel" -> volume();
            case "phase" -> phase;
            case "partitions" -> partitions;
            case "averages" -> averages;
            case "bandwidth" -> bandwidth;
            case "field" -> field;
            case "acceleration" -> acceleration;
            case "g" -> g;
            default -> throw new IllegalArgumentException(key);
        };
    }

    /** This protocol with every value {@code over} states replacing this one's. */
    public Protocol overriddenBy(Protocol over) {
        List<String> n = new ArrayList<>(notes);
        n.addAll(over.notes);
        return new Protocol(over.voxel != null ? over.voxel : voxel, first(over.phase, phase),
                first(over.partitions, partitions), first(over.averages, averages), first(over.bandwidth, bandwidth),
                first(over.field, field), first(over.acceleration, acceleration), first(over.g, g), n, slab || over.slab);
    }

    private static Double first(Double a, Double b) {
        return a != null ? a : b;
    }

    /** Nothing known. */
    public static Protocol empty() {
        return new Protocol(null, null, null, null, null, null, null, null, List.of());
    }

    /**
     * Parses {@code KEY=VALUE} pairs separated by commas, semicolons or spaces, e.g.
     * {@code voxel=1x1x5,phase=256,averages=1,bandwidth=130,field=3}.
     *
     * @param what the option's name, for messages (e.g. {@code --from})
     */
    public static Protocol parse(String text, String what) throws InputException {
        if (text == null || text.isBlank()) {
            throw new InputException(what + " is empty: give KEY=VALUE pairs, e.g. voxel=1x1x5,phase=256,averages=1,"
                    + "bandwidth=130,field=3 (keys: " + String.join(", ", KEYS) + ")");
        }
        double[] voxel = null;
        Map<String, Double> v = new LinkedHashMap<>();
        // "key = value" with spaces around the sign is read as key=value
        for (String part : text.trim().replaceAll("\\s*=\\s*", "=").split("[,;\\s]+")) {
            int eq = part.indexOf('=');
            if (eq <= 0 || eq == part.length() - 1) {
                throw new InputException(what + ": '" + part + "' is not KEY=VALUE (e.g. bandwidth=130)");
            }
            String key = part.substring(0, eq).trim().toLowerCase(Locale.ROOT);
            String value = part.substring(eq + 1).trim();
            if (!KEYS.contains(key)) {
                throw new InputException(what + ": unknown key '" + key + "'; the keys are "
                        + String.join(", ", KEYS));
            }
            if (v.containsKey(key) || (key.equals("voxel") && voxel != null)) {
                throw new InputException(what + ": '" + key + "' is given twice");
            }
            if (key.equals("voxel")) {
                String[] s = value.toLowerCase(Locale.ROOT).split("x");
                if (s.length != 3) {
                    throw new InputException(what + ": voxel=" + value + " should be three sizes in mm, e.g. voxel=1x1x5");
                }
                voxel = new double[3];
                for (int i = 0; i < 3; i++) {
                    voxel[i] = positive(what, "voxel", s[i]);
                }
            } else {
                double d = positive(what, key, value);
                if ((key.equals("acceleration") || key.equals("g")) && d < 1) {
                    throw new InputException(what + ": " + key + "=" + value + " is below 1; "
                            + (key.equals("g") ? "a g-factor is at least 1" : "an acceleration factor R is at least 1"));
                }
                v.put(key, d);
            }
        }
        return new Protocol(voxel, v.get("phase"), v.get("partitions"), v.get("averages"), v.get("bandwidth"),
                v.get("field"), v.get("acceleration"), v.get("g"), List.of());
    }

    private static double positive(String what, String key, String value) throws InputException {
        try {
            double d = Double.parseDouble(value.trim());
            if (d > 0 && Double.isFinite(d)) {
                return d;
            }
        } catch (NumberFormatException e) {
            // reported below
        }
        throw new InputException(what + ": " + key + "=" + value + " is not a positive number");
    }

    /** The protocol as {@code KEY=VALUE} text (known values only). */
    public String text() {
        List<String> s = new ArrayList<>();
        if (voxel != null) {
            s.add(String.format(Locale.ROOT, "voxel=%sx%sx%s", num(voxel[0]), num(voxel[1]), num(voxel[2])));
        }
        for (String k : KEYS.subList(1, KEYS.size())) {
            Double d = value(k);
            if (d != null) {
                s.add(k + "=" + num(d));
            }
        }
        return String.join(",", s);
    }

    private static String num(double d) {
        return d == Math.rint(d) && Math.abs(d) < 1e9 ? Long.toString((long) d) : String.format(Locale.ROOT, "%.6g", d)
                .replaceAll("0+$", "").replaceAll("\\.$", "");
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof Protocol p && text().equals(p.text());
    }

    @Override
    public int hashCode() {
        return text().hashCode();
    }

    @Override
    public String toString() {
        return text();
    }
}
