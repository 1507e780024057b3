package org.noisewise.io;

import ij.gui.Plot;
import java.awt.Color;
import java.util.Locale;
import org.apache.commons.math3.distribution.NakagamiDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.noisewise.diagnose.BackgroundCheck;
import org.noisewise.diagnose.BackgroundDiagnostics;

/**
 * The background histogram (as a density) with the fitted Rayleigh / chi(2L) curve and, for
 * comparison, the Gaussian of the same mean and SD, as an ImageJ {@link Plot}.
 */
public final class HistogramPlot {

    private HistogramPlot() {
    }

    public static Plot build(String title, double[] values, BackgroundDiagnostics.Diagnosis d, String unit) {
        BackgroundCheck.Result r = d.check();
        double max = 0;
        for (double v : values) {
            max = Math.max(max, v);
        }
        double sigma = r.sigma();
        // no noise to fit (every value zero: a masked or zero-filled background): the histogram alone
        boolean fitted = sigma > 0 && Double.isFinite(sigma);
        double hi = Math.max(max, fitted ? sigma * (Math.sqrt(2.0 * r.channels()) + 4) : 0);
        if (!(hi > 0)) {
            hi = 1;
        }
        int bins = (int) Math.max(10, Math.min(100, Math.round(2 * Math.cbrt(values.length))));
        double width = hi / bins;
        double[] centres = new double[bins];
        double[] density = new double[bins];
        for (double v : values) {
            int b = (int) Math.max(0, Math.min(bins - 1, Math.floor(v / width)));
            density[b]++;
        }
        for (int b = 0; b < bins; b++) {
            centres[b] = (b + 0.5) * width;
            density[b] /= values.length * width;
        }
        Plot plot = new Plot(title, "Background value [" + unit + "]", "Probability density");
        plot.setColor(new Color(150, 150, 150), new Color(210, 210, 210));
        plot.add("bar", centres, density);
        if (fitted) {
            int m = 400;
            double[] x = new double[m];
            double[] model = new double[m];
            double[] gauss = new double[m];
            NakagamiDistribution chi = new NakagamiDistribution(r.channels(), 2.0 * r.channels() * sigma * sigma);
            NormalDistribution normal = new NormalDistribution(null, r.stats().mean(), Math.max(r.stats().sd(), 1e-12));
            for (int i = 0; i < m; i++) {
                x[i] = hi * i / (m - 1);
                model[i] = chi.density(x[i]);
                gauss[i] = normal.density(x[i]);
            }
            plot.setLineWidth(2);
            plot.setColor(new Color(20, 90, 170));
            plot.add("line", x, model);
            plot.setColor(new Color(200, 110, 20));
            plot.setLineWidth(1);
            plot.add("line", x, gauss);
        }
        plot.setColor(Color.black);
        plot.setLegend(fitted ? "histogram\t" + BackgroundCheck.modelName(r.channels()) + String.format(Locale.ROOT,
                ", sigma = %.4g (ML)", sigma) + "\tGaussian, same mean and SD" : "histogram (no noise to fit)",
                Plot.TOP_RIGHT | Plot.AUTO_POSITION);
        plot.addLabel(0.45, 0.42, String.format(Locale.ROOT, "verdict: %s", d.verdict().key()));
        plot.addLabel(0.45, 0.50, "fit p = " + p(r.fitP()) + ", agreement p = " + p(r.agreementP()));
        plot.setLimits(0, hi, 0, Double.NaN);
        return plot;
    }

    /** A p value with three decimals, or n/a when the test could not be made. */
    private static String p(double value) {
        return Double.isFinite(value) ? String.format(Locale.ROOT, "%.3f", value) : "n/a";
    }
}
