package org.noisewise.io;

import ij.gui.Plot;
import java.awt.Color;
import org.noisewise.series.StabilityResult;

/** The stability plots of one slice: the region-mean series with its fit, the residual spectrum, the Weisskoff curve. */
public final class StabilityPlots {

    private StabilityPlots() {
    }

    /** The region-mean series (frames used) with its second-order fit; time in seconds when the frame interval is known. */
    public static Plot series(String title, StabilityResult r, String unit) {
        boolean timed = Double.isFinite(r.repetitionSeconds()) && r.repetitionSeconds() > 0;
        double[] x = new double[r.framesUsed()];
        for (int t = 0; t < x.length; t++) {
            x[t] = timed ? (r.skipped() + t) * r.repetitionSeconds() : r.skipped() + t + 1;
        }
        Plot p = new Plot(title, timed ? "Time [s]" : "Frame", "Region mean [" + unit + "]");
        p.setColor(Color.darkGray);
        p.add("connected circle", x, r.series());
        p.setColor(Color.red);
        p.setLineWidth(2);
        p.add("line", x, r.fit());
        p.setLineWidth(1);
        p.setColor(Color.black);
        p.addLegend("region mean\tsecond-order fit");
        PlotAxes.fit(p, new double[][] {x}, new double[][] {r.series(), r.fit()}, false);
        return p;
    }

    /** The power spectrum of the region-mean residuals (after the fit), from 0 to the Nyquist frequency. */
    public static Plot spectrum(String title, StabilityResult r, String unit) {
        boolean timed = Double.isFinite(r.repetitionSeconds()) && r.repetitionSeconds() > 0;
        Plot p = new Plot(title, timed ? "Frequency [Hz]" : "Frequency [cycles per frame]", "Residual power [" + unit
                + "^2]");
        p.setColor(Color.blue);
        p.add("line", r.frequency(), r.power());
        p.setColor(Color.black);
        PlotAxes.fit(p, new double[][] {r.frequency()}, new double[][] {r.power()}, true);
        return p;
    }

    /**
     * The Weisskoff curve: the percent coefficient of variation of the detrended mean of an n x n region
     * against n, with the ideal {@code F(1) / n} of independent voxels, both axes logarithmic (plain
     * numbers, {@link PlotAxes#logLog}).
     */
    public static Plot weisskoff(String title, StabilityResult r) {
        double[] n = new double[r.roiSize()];
        for (int k = 0; k < n.length; k++) {
            n[k] = k + 1;
        }
        Plot p = new Plot(title, "Region side n [pixels] (log scale)", "Fluctuation F(n) [%] (log scale)");
        PlotAxes.logLog(p, new double[][] {n}, new double[][] {r.ideal(), r.weisskoff()});
        p.setColor(Color.gray);
        p.add("line", PlotAxes.log(n), PlotAxes.log(r.ideal()));
        p.setColor(Color.red);
        p.add("connected circle", PlotAxes.log(n), PlotAxes.log(r.weisskoff()));
        p.setColor(Color.black);
        p.addLegend("ideal F(1)/n\tmeasured F(n)");
        return p;
    }
}
