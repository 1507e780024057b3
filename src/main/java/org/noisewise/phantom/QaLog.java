package org.noisewise.phantom;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The QA log's rows, their CSV form, and the site's own baseline control limits.
 *
 * <p>Baseline, per key (scanner, coil, protocol) and metric, built in log order from sessions that
 * can be trusted: verdict {@code valid}, not a duplicate of an acquisition already logged, and the
 * metric present. Each such session joins until N have (default 5); from the {@value #MIN_COMPARE}rd
 * member on, a candidate is first compared with the members so far, and one beyond their action
 * limits is flagged and kept out, so an out-of-control session never becomes part of the reference.
 * Centre and spread are robust: the median and 1.4826 times the median absolute deviation (the SD for
 * normal data), the spread never below {@value #SPREAD_FLOOR} of the centre (our choice, so that
 * identical values do not make every later change an action). Warning limits at 2 spreads, action
 * limits at 3 (Shewhart-style, common practice in QA programmes), clipped to the metric's physical
 * range (0 for SNR, sigma and ghosting; 0-100% for uniformity).
 */
public final class QaLog {

    /** Default number of sessions that form the baseline. */
    public static final int DEFAULT_BASELINE = 5;
    /** From this many members on, a candidate is checked against the baseline so far. */
    public static final int MIN_COMPARE = 3;
    /** The spread is at least this fraction of the centre. */
    public static final double SPREAD_FLOOR = 0.01;
    /** The word in a flag that keeps a session out of the baseline. */
    public static final String DUPLICATE = "duplicate";

    /** The columns, in file order. */
    public static final List<String> COLUMNS = List.of("recorded_utc", "acquired", "scanner", "coil", "protocol",
            "image", "data_id", "method", "verdict", "snr", "snr_ci95_low", "snr_ci95_high", "snr_magnitude",
            "signal_amplitude", "sigma", "signal_mean", "snr_efficiency", "uniformity_piu", "nema_nonuniformity_percent",
            "ghosting_percent", "sfnr", "percent_fluctuation", "drift_percent", "rdc", "flags");

    /** The metrics tracked against the baseline, with their labels. */
    public static final Map<String, String> METRICS = metrics();

    private QaLog() {
    }

    private static Map<String, String> metrics() {
        Map<String, String> m = new LinkedHashMap<>();
        m.put("snr", "SNR");
        m.put("sigma", "Noise sigma");
        m.put("signal_mean", "Signal mean");
        m.put("snr_efficiency", "SNR efficiency");
        m.put("uniformity_piu", "Percent integral uniformity");
        m.put("nema_nonuniformity_percent", "NEMA non-uniformity (%)");
        m.put("ghosting_percent", "Percent-signal ghosting");
        m.put("sfnr", "SFNR");
        m.put("percent_fluctuation", "Percent fluctuation");
        m.put("drift_percent", "Drift (%)");
        m.put("rdc", "Radius of decorrelation");
        return m;
    }

    /** The physical range of a metric: {low, high}. */
    public static double[] range(String metric) {
        return switch (metric) {
            case "uniformity_piu", "nema_nonuniformity_percent" -> new double[] {0, 100};
            default -> new double[] {0, Double.POSITIVE_INFINITY};
        };
    }

    /** One row: values by column name (numbers as text, blank when missing). */
    public record Entry(Map<String, String> values) {
        public Entry {
            values = Map.copyOf(values);
        }

        public String get(String column) {
            return values.getOrDefault(column, "");
        }

        public double number(String column) {
            String v = get(column);
            try {
                return v.isBlank() ? Double.NaN : Double.parseDouble(v);
            } catch (NumberFormatException e) {
                return Double.NaN;
            }
        }

        /**
         * The baseline key: scanner, coil and protocol (and the method for stability runs, whose static-noise
         * SNR is not the phantom QA's SNR).
         */
        public String key() {
            return get("scanner") + " | " + get("coil") + " | " + get("protocol")
                    + ("stability".equals(get("method")) ? " | stability" : "");
        }
    }

    /** The header line. */
    public static String header() {
        return String.join(",", COLUMNS);
    }

    /** A row as one CSV line (RFC 4180 quoting). */
    public static String line(Entry e) {
        return line(e, COLUMNS);
    }

    /** A row as one CSV line in the given columns (those of an existing log's header). */
    public static String line(Entry e, List<String> columns) {
        List<String> out = new ArrayList<>();
        for (String c : columns) {
            out.add(quote(e.get(c)));
        }
        return String.join(",", out);
    }

    /** The column names of a log's first line. */
    public static List<String> headerOf(String text) {
        List<List<String>> r = records(text);
        return r.isEmpty() ? COLUMNS : r.get(0);
    }

    private static String quote(String s) {
        if (s.contains(",") || s.contains("\"") || s.contains("\n") || s.contains("\r")) {
            return '"' + s.replace("\"", "\"\"") + '"';
        }
        return s;
    }

    /**
     * Parses the log's text. Lines that do not have every column (for instance a line cut short by a
     * crash of some other writer) are skipped, so one damaged line never hides the rest of the history.
     */
    public static List<Entry> parse(String text) {
        List<Entry> out = new ArrayList<>();
        List<List<String>> records = records(text);
        if (records.isEmpty()) {
            return out;
        }
        List<String> head = records.get(0);
        for (int r = 1; r < records.size(); r++) {
            List<String> f = records.get(r);
            if (f.size() != head.size()) {
                continue;
            }
            Map<String, String> m = new LinkedHashMap<>();
            for (int i = 0; i < head.size(); i++) {
                m.put(head.get(i), f.get(i));
            }
            out.add(new Entry(m));
        }
        return out;
    }

    /** RFC 4180 records; a final record without its line end is dropped as incomplete. */
    static List<List<String>> records(String text) {
        List<List<String>> out = new ArrayList<>();
        List<String> fields = new ArrayList<>();
        StringBuilder cur = new StringBuilder();
        boolean quoted = false;
        int i = 0;
        while (i < text.length()) {
            char c = text.charAt(i);
            if (quoted) {
                if (c == '"') {
                    if (i + 1 < text.length() && text.charAt(i + 1) == '"') {
                        cur.append('"');
                        i++;
                    } else {
                        quoted = false;
                    }
                } else {
                    cur.append(c);
                }
            } else if (c == '"') {
                quoted = true;
            } else if (c == ',') {
                fields.add(cur.toString());
                cur.setLength(0);
            } else if (c == '\n' || c == '\r') {
                if (c == '\r' && i + 1 < text.length() && text.charAt(i + 1) == '\n') {
                    i++;
                }
                fields.add(cur.toString());
                cur.setLength(0);
                if (!(fields.size() == 1 && fields.get(0).isEmpty())) {
                    out.add(fields);
                }
                fields = new ArrayList<>();
            } else {
                cur.append(c);
            }
            i++;
        }
        return out;
    }

    /**
     * A metric's baseline for one key.
     *
     * @param sessions the members so far
     * @param needed   N
     */
    public record Baseline(String metric, int sessions, int needed, double center, double spread, double warningLow,
                           double warningHigh, double actionLow, double actionHigh) {
        public boolean complete() {
            return sessions >= needed;
        }

        /** Whether the limits can be used to judge a session ({@value #MIN_COMPARE} members or more). */
        public boolean usable() {
            return sessions >= MIN_COMPARE;
        }
    }

    /** Whether an entry may join a baseline: a valid, non-duplicate session. */
    public static boolean eligible(Entry e) {
        return "valid".equals(e.get("verdict")) && !e.get("flags").contains(DUPLICATE);
    }

    /**
     * The baseline of {@code metric} from {@code history} for this key, built in order (see the class
     * description).
     */
    public static Baseline baseline(List<Entry> history, String key, String metric, int n) {
        List<Double> members = new ArrayList<>();
        for (Entry e : history) {
            if (members.size() >= n) {
                break;
            }
            double x = e.number(metric);
            if (!e.key().equals(key) || !eligible(e) || !Double.isFinite(x)) {
                continue;
            }
            if (members.size() >= MIN_COMPARE) {
                Baseline sofar = limits(metric, members, n);
                if (x < sofar.actionLow() || x > sofar.actionHigh()) {
                    continue;
                }
            }
            members.add(x);
        }
        return limits(metric, members, n);
    }

    /** Centre, spread and limits of a set of members. */
    static Baseline limits(String metric, List<Double> members, int n) {
        if (members.isEmpty()) {
            return new Baseline(metric, 0, n, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN);
        }
        double center = median(members);
        List<Double> dev = members.stream().map(x -> Math.abs(x - center)).toList();
        double spread = Math.max(1.4826 * median(dev), SPREAD_FLOOR * Math.abs(center));
        if (!(spread > 0)) {
            spread = Double.MIN_NORMAL;
        }
        double[] r = range(metric);
        return new Baseline(metric, members.size(), n, center, spread, clip(center - 2 * spread, r),
                clip(center + 2 * spread, r), clip(center - 3 * spread, r), clip(center + 3 * spread, r));
    }

    private static double clip(double v, double[] r) {
        return Math.max(r[0], Math.min(r[1], v));
    }

    private static double median(List<Double> v) {
        double[] a = v.stream().mapToDouble(Double::doubleValue).sorted().toArray();
        int n = a.length;
        return n % 2 == 1 ? a[n / 2] : 0.5 * (a[n / 2 - 1] + a[n / 2]);
    }

    /**
     * How a value compares with its baseline: "" while the baseline has fewer than
     * {@value #MIN_COMPARE} members or the value is inside the warning limits, else a flag with
     * "warning" or "action".
     */
    public static String flag(Baseline b, double value, String label) {
        if (!b.usable() || !Double.isFinite(value)) {
            return "";
        }
        if (value < b.actionLow() || value > b.actionHigh()) {
            return String.format(Locale.ROOT, "%s %.4g is outside the baseline's action limits %.4g-%.4g (centre %.4g, "
                    + "%d sessions) (action)", label, value, b.actionLow(), b.actionHigh(), b.center(), b.sessions());
        }
        if (value < b.warningLow() || value > b.warningHigh()) {
            return String.format(Locale.ROOT, "%s %.4g is outside the baseline's warning limits %.4g-%.4g (centre %.4g, "
                    + "%d sessions) (warning)", label, value, b.warningLow(), b.warningHigh(), b.center(), b.sessions());
        }
        return "";
    }

    /** The earlier entry with the same pixels ({@code data_id}), or null. */
    public static Entry duplicateOf(List<Entry> history, String dataId) {
        if (dataId == null || dataId.isBlank()) {
            return null;
        }
        for (Entry e : history) {
            if (dataId.equals(e.get("data_id"))) {
                return e;
            }
        }
        return null;
    }
}
