package org.noisewise.measure;

import java.util.BitSet;
import org.noisewise.diagnose.BackgroundSnr;
import org.noisewise.diagnose.BackgroundSnrResult;
import org.noisewise.estimate.Cnr;
import org.noisewise.estimate.DifferenceSnr;
import org.noisewise.estimate.DifferenceSnrResult;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Interval;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.RepeatedAcquisitions;
import org.noisewise.estimate.RepeatedSnrResult;

/**
 * The contrast-to-noise ratio of a signal region against the contrast region, as each SNR method
 * defines sigma: the background method's sigma from air; the difference and repeated methods' sigma
 * pooled over the two regions ({@link Cnr#pooledSigma}). Each region's mean has its own standard
 * error with its effective pixel count from the measured noise correlation.
 */
final class Contrast {

    private Contrast() {
    }

    /** The background method: the contrast region's mean and spread on the same plane, sigma from air. */
    static Cnr background(float[] pixels, int width, Region signal, Region contrast, BackgroundSnrResult r)
            throws InputException {
        requireApart(signal, contrast);
        if (r.figures() == null) {
            return null;
        }
        BackgroundSnr.Signal c = BackgroundSnr.Signal.of(pixels, width, contrast);
        return Cnr.of(r.signal().stats().mean(), r.signal().standardError(), c.stats().mean(), c.standardError(),
                r.sigma().sigma(), r.sigma().ci95(), r.channels(), contrast.name());
    }

    /** The difference method: the average image's means, sigma pooled over both regions. */
    static Cnr difference(float[] a, float[] b, int width, Region signal, Region contrast, DifferenceSnrResult s,
                          int channels, double step) throws InputException {
        requireApart(signal, contrast);
        DifferenceSnrResult c = DifferenceSnr.analyze(a, b, width, contrast, channels, step);
        double[] sigma = Cnr.pooledSigma(s.figures(), c.figures());
        return Cnr.of(s.averageMean(), s.averageStandardError(), c.averageMean(), c.averageStandardError(), sigma[0],
                new Interval(sigma[1], sigma[2]), channels, contrast.name());
    }

    /** The repeated method: the temporal-mean means over the regions, sigma pooled over both regions. */
    static Cnr repeated(RepeatedAcquisitions.Maps maps, RepeatedAcquisitions.Frames frames, Region signal,
                        Region contrast, RepeatedSnrResult s, int channels, double step) throws InputException {
        requireApart(signal, contrast);
        RepeatedSnrResult c = RepeatedAcquisitions.summarize(maps, frames, contrast, channels, step);
        double[] sigma = Cnr.pooledSigma(s.figures(), c.figures());
        return Cnr.of(s.signalMean(), s.meanStandardError(), c.signalMean(), c.meanStandardError(), sigma[0],
                new Interval(sigma[1], sigma[2]), channels, contrast.name());
    }

    /** The two tissues must not share pixels (their errors would no longer be independent). */
    static void requireApart(Region signal, Region contrast) throws InputException {
        BitSet in = new BitSet();
        for (int i : signal.indices()) {
            in.set(i);
        }
        int shared = 0;
        for (int i : contrast.indices()) {
            shared += in.get(i) ? 1 : 0;
        }
        if (shared > 0) {
            throw new InputException("the contrast region '" + contrast.name() + "' shares " + shared + " pixels with "
                    + "the signal region '" + signal.name() + "': draw the contrast region on the second tissue, "
                    + "apart from the signal region");
        }
    }
}
