package org.noisewise.report;

import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.Interval;

/**
 * The headline cells every method shares, in one order: the corrected SNR and its interval first,
 * then the plain magnitude ratio, the corrected amplitude and sigma. Withheld figures (an invalid
 * verdict) are blank cells and JSON {@code null}.
 */
final class Figures {

    private Figures() {
    }

    /** The SNR cells: corrected SNR, its interval, and the plain magnitude ratio of the figures. */
    static void snr(ResultRow row, CorrectedSnr f, String plainHeading) {
        snr(row, f, plainHeading, f == null ? null : f.magnitudeSnr());
    }

    /** The SNR cells with the method's own plain ratio (e.g. NEMA's {@code sqrt(2) S / SD(diff)}). */
    static void snr(ResultRow row, CorrectedSnr f, String plainHeading, Double plain) {
        row.add("snr", "SNR (corrected)", f == null ? null : f.snr())
                .add("snr_ci95[0]", "SNR 95% low", f == null ? null : f.snrCi95().low())
                .add("snr_ci95[1]", "SNR 95% high", f == null ? null : f.snrCi95().high())
                .add("snr_magnitude", plainHeading, plain);
    }

    /** The amplitude cells. */
    static void amplitude(ResultRow row, CorrectedSnr f, String u) {
        row.add("signal_amplitude", "Signal amplitude (corrected)" + u, f == null ? null : f.amplitude())
                .add("signal_amplitude_ci95[0]", "Amplitude 95% low" + u, f == null ? null : f.amplitudeCi95().low())
                .add("signal_amplitude_ci95[1]", "Amplitude 95% high" + u, f == null ? null : f.amplitudeCi95().high());
    }

    /** Sigma and its interval; blank when not positive (a masked background has no sigma). */
    static void sigma(ResultRow row, String heading, double sigma, Interval ci, String u) {
        boolean ok = sigma > 0;
        row.add("sigma", heading + u, ok ? sigma : null)
                .add("sigma_ci95[0]", "Sigma 95% low" + u, ok ? ci.low() : null)
                .add("sigma_ci95[1]", "Sigma 95% high" + u, ok ? ci.high() : null);
    }
}
