package org.noisewise.report;

import org.noisewise.phantom.PhantomQa;
import org.noisewise.phantom.PlacedRegion;

/** The columns of a phantom QA result, described once for every output. */
public final class QaRows {

    private QaRows() {
    }

    public static ResultRow row(String image, int slice, String unit, PhantomQa.Result r) {
        String u = " [" + unit + "]";
        double[] sides = r.sideMeans();
        ResultRow row = new ResultRow()
                .add("image", "Image", image)
                .add("slice", "Slice", slice)
                .add("method", "SNR method", r.method())
                .add("verdict", "Verdict", r.verdict().key());
        Figures.snr(row, r.figures(), "SNR plain (magnitude)");
        Figures.amplitude(row, r.figures(), u);
        Figures.sigma(row, "Sigma (corrected)", r.sigma(), r.sigmaCi95(), u);
        row.add("signal_mean", "Signal mean (magnitude)" + u, r.signalMean())
                .add("uniformity_piu", "PIU [%]", r.piu())
                .add("uniformity_high", "Uniformity high" + u, r.windows().high())
                .add("uniformity_low", "Uniformity low" + u, r.windows().low())
                .add("nema_nonuniformity_percent", "NEMA non-uniformity [%]", r.nemaNonUniformity())
                .add("ghosting_percent", "Ghosting [%]", r.ghostingPercent())
                .add("ghost_means.top", "Ghost top" + u, sides[0])
                .add("ghost_means.bottom", "Ghost bottom" + u, sides[1])
                .add("ghost_means.left", "Ghost left" + u, sides[2])
                .add("ghost_means.right", "Ghost right" + u, sides[3])
                .add("limits.piu_min", "PIU limit [%]", r.limits() == null ? null : r.limits().minimumPiu())
                .add("limits.ghosting_max", "Ghosting limit [%]",
                        r.limits() == null ? null : r.limits().maximumGhostingPercent())
                .add("limits.piu_pass", "PIU within limit", r.piuPasses() == null ? null : r.piuPasses() ? "yes" : "no")
                .add("limits.ghosting_pass", "Ghosting within limit",
                        r.ghostingPasses() == null ? null : r.ghostingPasses() ? "yes" : "no")
                .add("pixels.signal", "Signal pixels", r.placement().signal().region().size());
        if (r.air() != null) {
            row.add("pixels.background", "Background pixels", r.air().pixels())
                    .add("background_share", "Air share [%]", 100 * r.air().share());
        }
        for (PlacedRegion p : regions(r)) {
            String k = "regions." + p.name().replace(' ', '_');
            row.add(k + ".shape", null, p.kind() == PlacedRegion.Kind.OVAL ? "oval" : "rectangle");
            row.add(k + ".x", null, p.x());
            row.add(k + ".y", null, p.y());
            row.add(k + ".w", null, p.w());
            row.add(k + ".h", null, p.h());
        }
        return row.add("warnings", "Warnings", r.warnings());
    }

    /** Every region of the result: signal, side (ghost) regions, background regions, uniformity windows. */
    public static java.util.List<PlacedRegion> regions(PhantomQa.Result r) {
        java.util.List<PlacedRegion> out = new java.util.ArrayList<>(r.placement().all());
        out.addAll(r.placement().background());
        // the uniformity windows' geometry (their pixels are not needed here)
        out.add(new PlacedRegion("uniformity high", PlacedRegion.Kind.RECTANGLE, r.windows().highX(), r.windows().highY(),
                r.windows().w(), r.windows().h(), null));
        out.add(new PlacedRegion("uniformity low", PlacedRegion.Kind.RECTANGLE, r.windows().lowX(), r.windows().lowY(),
                r.windows().w(), r.windows().h(), null));
        return out;
    }
}
