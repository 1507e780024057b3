package org.noisewise.cli;

import ij.ImagePlus;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.noisewise.estimate.BackgroundSnr;
import org.noisewise.estimate.BackgroundSnrResult;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SigmaEstimate;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.estimate.Warning;
import org.noisewise.io.ImageFiles;
import org.noisewise.io.ImagePlanes;
import org.noisewise.sample.SampleCatalog;
import org.noisewise.sample.SampleCatalog.Rect;
import org.noisewise.sample.SampleCatalog.Sample;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code noisewise demo}: runs the measurements on the bundled samples and prints each beside the
 * known truth and beside the uncorrected hand method.
 */
@Command(name = "demo", mixinStandardHelpOptions = true,
        description = "Measure the bundled sample images and compare with their known truth.")
public class DemoCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Option(names = "--samples", paramLabel = "DIR", defaultValue = "sample-images",
            description = "Folder of the sample images (default: ${DEFAULT-VALUE}).")
    Path samples;

    @Override
    public Integer call() throws InputException {
        if (!Files.isDirectory(samples)) {
            throw new InputException("sample folder '" + samples + "' not found: run the demo from the "
                    + "repository's top folder or give --samples DIR");
        }
        PrintWriter out = spec.commandLine().getOut();
        out.println("Noisewise demo: background-corrected SNR on the bundled samples in " + samples);
        out.println("Scenario (invented): the imaging-physics bench of the fictional Fernhollow Institute.");
        out.println("Truth is known because the images were generated (org.noisewise.sample.SampleCatalog).");
        for (Sample s : SampleCatalog.SAMPLES) {
            out.println();
            report(out, s);
        }
        out.println();
        out.println("Hand method = signal mean / SD of air, uncorrected: too high by 1/0.655 = 1.53x for one channel.");
        out.println("For image-quality QA and research only, not diagnosis; acceptance decisions rest with your site's");
        out.println("qualified medical physicist and local regulations.");
        out.flush();
        return 0;
    }

    private void report(PrintWriter out, Sample s) throws InputException {
        ImagePlus imp = ImageFiles.open(samples.resolve(s.file()));
        float[] px = ImagePlanes.calibratedPixels(imp, 1);
        Region signal = region("signal", s.signal(), imp);
        List<Region> bg = new ArrayList<>();
        for (int i = 0; i < s.background().size(); i++) {
            bg.add(region("background " + (i + 1), s.background().get(i), imp));
        }
        BackgroundSnrResult r = BackgroundSnr.analyze(px, signal, bg,
                new BackgroundSnr.Options(s.channels(), SigmaEstimator.ML));
        SigmaEstimate sig = r.sigma();
        out.printf(Locale.ROOT, "%s  (%s)%n", s.file(), s.description());
        out.printf(Locale.ROOT, "  %-34s %10s %10s   %s%n", "", "true", "measured", "95% interval");
        out.printf(Locale.ROOT, "  %-34s %10.3f %10.3f   [%.3f, %.3f]%n", "noise sigma, L = " + s.channels()
                + " (a.u.)", s.sigma(), sig.sigma(), sig.ci95().low(), sig.ci95().high());
        out.printf(Locale.ROOT, "  %-34s %10.2f %10.2f   [%.2f, %.2f]%n", "SNR", s.trueSnr(), r.snr(),
                r.snrCi95().low(), r.snrCi95().high());
        double hand = r.signal().mean() / r.background().sd();
        out.printf(Locale.ROOT, "  %-34s %10.2f %10.2f   (%+.0f%% off)%n", "hand method S / SD(air)", s.trueSnr(),
                hand, 100 * (hand / s.trueSnr() - 1));
        if (s.channels() > 1) {
            BackgroundSnrResult wrong = BackgroundSnr.analyze(px, signal, bg,
                    new BackgroundSnr.Options(1, SigmaEstimator.MEAN));
            out.printf(Locale.ROOT, "  %-34s %10.3f %10.3f   (%.2fx the truth: channel count matters)%n",
                    "sigma if L = 1 were assumed", s.sigma(), wrong.sigma().sigma(),
                    wrong.sigma().sigma() / s.sigma());
        }
        if (r.warnings().isEmpty()) {
            out.println("  warnings: none");
        }
        for (Warning w : r.warnings()) {
            out.println("  warning [" + w.code() + "]: " + w.message());
        }
    }

    private static Region region(String name, Rect r, ImagePlus imp) throws InputException {
        return Region.rectangle(name, r.x(), r.y(), r.w(), r.h(), imp.getWidth(), imp.getHeight());
    }
}
