package org.noisewise.phantom;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.noisewise.diagnose.AirFinder;
import org.noisewise.diagnose.BackgroundCheck;
import org.noisewise.diagnose.BackgroundDiagnostics;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.diagnose.Verdict;
import org.noisewise.diagnose.BackgroundSnr;
import org.noisewise.diagnose.BackgroundSnrResult;
import org.noisewise.estimate.CorrectedSnr;
import org.noisewise.estimate.DifferenceSnr;
import org.noisewise.estimate.DifferenceSnrResult;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Interval;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RepeatedAcquisitions;
import org.noisewise.estimate.RepeatedSnrResult;
import org.noisewise.estimate.SampleStats;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.estimate.Warning;

/**
 * Phantom QA in one pass on one slice: find the phantom (or take the user's regions), place the
 * regions, measure SNR by the best method the data allow (difference for two acquisitions, repeated
 * acquisitions for three or more, otherwise background with its verdict), percent integral
 * uniformity, NEMA-style non-uniformity and percent-signal ghosting, and compare with the published
 * action limits when asked.
 */
public final class PhantomQa {

    private PhantomQa() {
    }

    /**
     * What to measure.
     *
     * @param frames        one or more acquisitions of the slice (calibrated values)
     * @param threshold     intensity separating phantom from air (from an auto-threshold method)
     * @param fraction      signal-region fraction of the phantom area
     * @param phase         phase-encoding direction
     * @param pixelWidthMm  pixel size in mm, NaN when uncalibrated
     * @param pixelHeightMm pixel size in mm, NaN when uncalibrated
     * @param channels      stated channel count, or null for auto
     * @param storage       storage facts for the background checks
     * @param limits        published limits to apply, or null
     * @param placement     regions to use instead of automatic placement (the user's adjusted ones), or null
     * @param autoAir       the background from all the air ({@link AirFinder}) instead of the placed regions
     */
    public record Input(float[][] frames, int width, int height, double threshold, double fraction,
                        PhaseDirection phase, double pixelWidthMm, double pixelHeightMm, Integer channels,
                        BackgroundCheck.Storage storage, ActionLimits limits, QaRegions.Placement placement,
                        boolean autoAir) {
        public Input(float[][] frames, int width, int height, double threshold, double fraction,
                     PhaseDirection phase, double pixelWidthMm, double pixelHeightMm, Integer channels,
                     BackgroundCheck.Storage storage, ActionLimits limits, QaRegions.Placement placement) {
            this(frames, width, height, threshold, fraction, phase, pixelWidthMm, pixelHeightMm, channels, storage,
                    limits, placement, false);
        }

        public Input {
            // the list of frames is copied; the planes are read only
            frames = frames.clone();
        }

        @Override
        public float[][] frames() {
            return frames.clone();
        }
    }

    /**
     * Everything measured.
     *
     * @param signalMean the signal region's magnitude mean (uncorrected)
     * @param figures    corrected amplitude, sigma and SNR with intervals; {@code null} when withheld
     * @param air        the automatic air, or null when the placed background regions were used
     */
    public record Result(QaRegions.Placement placement, Phantom phantom, String method, double signalMean,
                         CorrectedSnr figures, Verdict verdict, QaMetrics.Windows windows, double piu,
                         double nemaNonUniformity, double ghostingPercent, double[] sideMeans, ActionLimits limits,
                         Boolean piuPasses, Boolean ghostingPasses, BackgroundDiagnostics.Diagnosis backgroundDiagnosis,
                         double[] backgroundValues, List<Warning> warnings, AirFinder.Result air) {
        private static final Interval NONE = new Interval(Double.NaN, Double.NaN);

        public Result {
            sideMeans = sideMeans.clone();
            backgroundValues = backgroundValues.clone();
            warnings = List.copyOf(warnings);
        }

        @Override
        public double[] sideMeans() {
            return sideMeans.clone();
        }

        @Override
        public double[] backgroundValues() {
            return backgroundValues.clone();
        }

        /** The corrected SNR, NaN when withheld. */
        public double snr() {
            return figures == null ? Double.NaN : figures.snr();
        }

        public Interval snrCi95() {
            return figures == null ? NONE : figures.snrCi95();
        }

        /** The corrected sigma, NaN when withheld. */
        public double sigma() {
            return figures == null ? Double.NaN : figures.sigma();
        }

        public Interval sigmaCi95() {
            return figures == null ? NONE : figures.sigmaCi95();
        }
    }

    public static Result run(Input in) throws InputException {
        return run(in, null);
    }

    /** The storage step of the frames (0: continuous), for Sheppard's correction of the difference and repeated sigma. */
    private static double step(Input in) {
        return in.storage() == null ? 0.0 : in.storage().step();
    }

    /**
     * @param progress receives the fraction done (0..1) after each stage (SNR, uniformity windows,
     *                 non-uniformity); may be null
     */
    public static Result run(Input in, java.util.function.DoubleConsumer progress) throws InputException {
        java.util.function.DoubleConsumer done = progress == null ? f -> { } : progress;
        if (in.frames().length == 0) {
            throw new InputException("no image to measure");
        }
        int w = in.width();
        int h = in.height();
        float[] first = in.frames()[0];
        Phantom phantom = null;
        QaRegions.Placement pl = in.placement();
        if (pl == null) {
            phantom = PhantomFinder.find(first, w, h, in.threshold());
            pl = QaRegions.place(phantom, w, h, in.fraction(), in.phase(), in.pixelWidthMm(), in.pixelHeightMm());
        }
        List<Warning> warnings = new ArrayList<>(pl.warnings());
        Region signal = pl.signal().region();
        List<Region> bg = pl.background().stream().map(PlacedRegion::region).toList();
        AirFinder.Result air = null;
        if (in.autoAir()) {
            air = AirFinder.find(first, w, h, in.channels() == null ? 0 : in.channels(), in.storage(), signal);
            bg = air.regions();
            pl = new QaRegions.Placement(pl.signal(), List.of(), pl.top(), pl.bottom(), pl.left(), pl.right(),
                    pl.windowW(), pl.windowH(), pl.warnings());
        }

        String method;
        CorrectedSnr figures;
        Verdict verdict = Verdict.VALID;
        // the image uniformity and ghosting are read from: the first frame, or the temporal mean of repeats
        // (so the ghost-region means and the signal mean come from the same image)
        float[] reference = first;
        BackgroundDiagnostics.Diagnosis diag = null;
        double[] bgValues = new double[0];
        if (!bg.isEmpty()) {
            bgValues = Region.pooledMagnitudes(first, bg);
        }
        double signalMean = SampleStats.of(signal.values(first)).mean();
        if (in.frames().length == 2) {
            DifferenceSnrResult d = DifferenceSnr.analyze(first, in.frames()[1], w, signal,
                    in.channels() == null ? 1 : in.channels(), step(in));
            method = "difference";
            figures = d.figures();
            warnings.addAll(d.warnings());
            if (!bg.isEmpty()) {
                diag = BackgroundDiagnostics.diagnose(first, w, h, signal, bg,
                        new BackgroundDiagnostics.Options(in.channels(), in.phase(), in.storage()));
            }
        } else if (in.frames().length > 2) {
            RepeatedAcquisitions.Maps m = RepeatedAcquisitions.maps(in.frames(), w, h, null);
            reference = m.mean();
            RepeatedSnrResult r = RepeatedAcquisitions.summarize(m, RepeatedAcquisitions.Frames.of(in.frames()), signal,
                    in.channels() == null ? 1 : in.channels(), step(in));
            method = "repeated";
            figures = r.figures();
            signalMean = r.signalMean();
            warnings.addAll(r.warnings());
            if (!bg.isEmpty()) {
                diag = BackgroundDiagnostics.diagnose(first, w, h, signal, bg,
                        new BackgroundDiagnostics.Options(in.channels(), in.phase(), in.storage()));
            }
        } else {
            if (bg.isEmpty()) {
                throw new InputException("no room for background regions beside the phantom and only one acquisition: "
                        + "give two acquisitions for the difference method, or a larger field of view");
            }
            BackgroundSnrResult r = BackgroundSnr.analyze(first, w, h, signal, bg,
                    new BackgroundSnr.Options(in.channels(), SigmaEstimator.ML, in.phase(), in.storage()));
            method = "background";
            figures = r.figures();
            verdict = r.verdict();
            diag = r.diagnosis();
            warnings.addAll(r.warnings());
            if (air != null) {
                AirFinder.Louder louder = AirFinder.louderNoise(first, w, h, air.mask(), r.channels(), signal);
                if (louder != null) {
                    warnings.add(AirFinder.louderWarning(louder));
                    verdict = verdict.worst(Verdict.QUESTIONABLE);
                }
            }
        }

        done.accept(0.5);
        QaMetrics.Windows win = QaMetrics.searchWindows(reference, w, h, signal, pl.windowW(), pl.windowH());
        double piu = QaMetrics.piu(win.high(), win.low());
        done.accept(0.75);
        double nu = QaMetrics.nemaNonUniformity(reference, w, h, signal);
        done.accept(1.0);
        double ghosting = Double.NaN;
        double[] sides = new double[] {Double.NaN, Double.NaN, Double.NaN, Double.NaN};
        if (pl.top() != null && pl.bottom() != null && pl.left() != null && pl.right() != null) {
            PlacedRegion[] four = {pl.top(), pl.bottom(), pl.left(), pl.right()};
            for (int i = 0; i < 4; i++) {
                sides[i] = SampleStats.of(four[i].region().values(reference)).mean();
            }
            ghosting = QaMetrics.ghostingPercent(sides[0], sides[1], sides[2], sides[3], signalMean);
        }
        Boolean piuOk = null;
        Boolean ghostOk = null;
        ActionLimits lim = in.limits();
        if (lim != null) {
            piuOk = lim.piuPasses(piu);
            if (!piuOk) {
                warnings.add(new Warning("piu_limit", String.format(Locale.ROOT, "percent integral uniformity %.1f%% is "
                        + "below the published action limit of %.1f%% at %.1f T", piu, lim.minimumPiu(), lim.fieldTesla())));
            }
            if (Double.isFinite(ghosting)) {
                ghostOk = lim.ghostingPasses(ghosting);
                if (!ghostOk) {
                    warnings.add(new Warning("ghosting_limit", String.format(Locale.ROOT, "percent-signal ghosting "
                            + "%.2f%% is above the published action limit of %.1f%%", ghosting, lim.maximumGhostingPercent())));
                }
            }
        }
        return new Result(pl, phantom, method, signalMean, figures, verdict, win, piu, nu, ghosting, sides, lim, piuOk,
                ghostOk, diag, bgValues, warnings, air);
    }
}
