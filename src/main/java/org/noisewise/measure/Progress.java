package org.noisewise.measure;

/** Where a measurement reports how far it has got: a fraction in [0, 1] and a short status line. */
@FunctionalInterface
public interface Progress {

    /** Reports nothing. */
    Progress NONE = (fraction, status) -> { };

    void report(double fraction, String status);

    /** The same sink for a part {@code [from, to]} of the whole job. */
    default Progress part(double from, double to) {
        Progress outer = this;
        return (fraction, status) -> outer.report(from + (to - from) * Math.max(0, Math.min(1, fraction)), status);
    }
}
