package org.noisewise.imagej;

import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.measure.BackgroundMeasure;
import org.noisewise.measure.Measurement;
import org.noisewise.measure.NoiseScanMeasure;
import org.noisewise.diagnose.NoiseScan;
import org.noisewise.measure.Planes;

/**
 * {@code Plugins>Noisewise>SNR (Background Regions)...}: the single-image SNR, sigma from background
 * regions under the Rayleigh / chi(2L) model, the signal amplitude corrected for magnitude bias.
 *
 * <p>Macro keys: {@code channels} (L, or {@code auto} to estimate the effective count), {@code estimator}
 * ([Maximum likelihood], [Mean-based], [SD-based], [Median-based]), {@code slices} ([Current slice] or
 * [All slices]), {@code roles} ([Region names] or [Selection is signal]), {@code phase}
 * ([Rows (ghosts left/right)], [Columns (ghosts above/below)] or [Unknown]; default from DICOM
 * 0018,1312), {@code second} (title of a second identical acquisition to check the background against,
 * or [None]), {@code noise-only} (title of a noise-only scan of the same protocol, or [None]: sigma then
 * comes from the scan's pixels in the signal region), {@code sigma} (show the scan's sigma map) with
 * {@code window} (its window in pixels, odd), {@code append} (rows to one table for all images), and {@code role_<name>} (signal,
 * background or ignore) for each ROI Manager region whose name implies no role.
 * Example: {@code run("SNR (Background Regions)...", "channels=1 estimator=[Maximum likelihood]
 * slices=[Current slice] roles=[Region names] second=None");}
 */
public class BackgroundSnrCommand implements PlugIn {

    static final String TITLE = "SNR (Background Regions)";
    static final String CURRENT = "Current slice";
    static final String ALL = "All slices";
    static final String BY_NAME = "Region names";
    static final String BY_SELECTION = "Selection is signal";
    static final String NONE = "None";
    static final String AIR_REGIONS = "ROI Manager regions";
    static final String AIR_AUTO = "Automatic (all air)";

    @Override
    public void run(String arg) {
        Errors.guard(TITLE, imp -> {
            Face.checkImage(imp, TITLE);
            RegionRoles regions = RegionRoles.of(imp);
            Face.requireRegions(regions, "The background method needs one signal region and at least one background "
                    + "region in air.");
            GenericDialog gd = new GenericDialog(TITLE);
            DialogFields.addChannels(gd);
            gd.addChoice("Estimator:", SigmaEstimator.labels(), SigmaEstimator.ML.label());
            gd.addChoice("Slices:", new String[] {CURRENT, ALL}, CURRENT);
            boolean named = regions.anyNamed(org.noisewise.io.RoleNames.SIGNAL);
            gd.addChoice("Roles from:", new String[] {BY_NAME, BY_SELECTION},
                    !named && regions.selection != null ? BY_SELECTION : BY_NAME);
            gd.addChoice("Background:", new String[] {AIR_REGIONS, AIR_AUTO}, AIR_REGIONS);
            DialogFields.addPhase(gd, imp);
            gd.addChoice("Second acquisition (optional check):", DialogFields.otherImages(imp, NONE), NONE);
            gd.addChoice("Noise-only scan:", DialogFields.otherImages(imp, NONE), NONE);
            gd.addCheckbox("Sigma map from the noise-only scan", false);
            gd.addNumericField("Window for the sigma map (pixels):", NoiseScan.DEFAULT_WINDOW, 0);
            regions.addFields(gd);
            Face.addAppend(gd);
            gd.addHelp(Face.help("SNR (Background Regions)"));
            gd.showDialog();
            if (gd.wasCanceled()) {
                return;
            }
            Integer channels = DialogFields.parseChannels(gd.getNextString());
            SigmaEstimator estimator = SigmaEstimator.parse(gd.getNextChoice());
            boolean all = ALL.equals(gd.getNextChoice());
            boolean bySelection = BY_SELECTION.equals(gd.getNextChoice());
            boolean auto = AIR_AUTO.equals(gd.getNextChoice());
            PhaseDirection phase = DialogFields.nextPhase(gd);
            String secondTitle = gd.getNextChoice();
            String scanTitle = gd.getNextChoice();
            boolean map = gd.getNextBoolean();
            double window = gd.getNextNumber();
            regions.readFields(gd);
            boolean append = gd.getNextBoolean();
            Roi signal;
            List<Roi> background = new ArrayList<>();
            if (bySelection) {
                if (regions.selection == null) {
                    throw new InputException("There is no area selection on the image: draw the signal region, or "
                            + "choose 'Roles from: Region names'.");
                }
                signal = regions.selection;
                if (!auto) {
                    background.addAll(regions.withoutRole(org.noisewise.io.RoleNames.CONTRAST));
                }
            } else {
                List<Roi> sig = regions.withRole(org.noisewise.io.RoleNames.SIGNAL);
                if (sig.size() > 1) {
                    throw new InputException("More than one ROI Manager region has the signal role: keep one (rename the "
                            + "others, or give them another role).");
                }
                signal = sig.isEmpty() ? null : sig.get(0);
                if (!auto) {
                    background.addAll(regions.withRole(org.noisewise.io.RoleNames.BACKGROUND));
                }
            }
            ImagePlus second = NONE.equals(secondTitle) ? null : WindowManager.getImage(secondTitle);
            Roi contrast = regions.contrastRegion();
            if (!NONE.equals(scanTitle)) {
                if (second != null) {
                    throw new InputException("A second acquisition and a noise-only scan are two ways to measure sigma: "
                            + "choose one of them (set the other to None).");
                }
                if (estimator != SigmaEstimator.ML) {
                    throw new InputException("With a noise-only scan sigma is its maximum-likelihood estimate: choose "
                            + "'Estimator: " + SigmaEstimator.ML.label() + "'.");
                }
                if (map && (!(window >= 3) || window % 2 != 1)) {
                    throw new InputException("The window for the sigma map must be an odd number of pixels, at least 3.");
                }
                ImagePlus scan = WindowManager.getImage(scanTitle);
                Measurement m = measureNoiseScan(imp, signal, background, auto, contrast, channels, all, scan,
                        map ? (int) window : 0);
                Face.show(TITLE, imp, m.rows(), append);
                Face.log(TITLE, m.notes());
                m.images().stream().filter(i -> i.getTitle().endsWith(" sigma map")).forEach(Face::showNew);
                Face.overlay(imp, List.of(signal), auto ? Face.airRegions(m, imp) : background, contrast);
                Face.reactivate(imp);
                return;
            }
            BackgroundMeasure.Options o = new BackgroundMeasure.Options(channels, estimator, phase);
            Measurement m = auto ? measureAutomaticAir(imp, signal, contrast, o, all, second)
                    : measure(imp, signal, background, contrast, o, all, second);
            Face.show(TITLE, imp, m.rows(), append);
            Face.log(TITLE, m.notes());
            Face.overlay(imp, List.of(signal), auto ? Face.airRegions(m, imp) : background, contrast);
            Face.reactivate(imp);
        });
    }

    /**
     * Measures the image without any dialog (for scripts and tests). Never modifies {@code imp}.
     *
     * @param second a second identical acquisition to check the background against, or null
     * @return a table with one row per measured slice
     */
    public static ResultsTable process(ImagePlus imp, Roi signal, List<Roi> background, BackgroundMeasure.Options o,
                                       boolean allSlices, ImagePlus second) throws InputException {
        return Tables.toResultsTable(measure(imp, signal, background, null, o, allSlices, second).rows());
    }

    /** As {@code process} above, with a contrast region (may be null) for the contrast-to-noise ratio. */
    public static ResultsTable process(ImagePlus imp, Roi signal, List<Roi> background, Roi contrast,
                                       BackgroundMeasure.Options o, boolean allSlices, ImagePlus second)
            throws InputException {
        return Tables.toResultsTable(measure(imp, signal, background, contrast, o, allSlices, second).rows());
    }

    /**
     * The background method with the air found automatically in every measured slice (no background
     * regions drawn); {@code contrast} may be null. Never modifies {@code imp}.
     */
    public static ResultsTable processAutomaticAir(ImagePlus imp, Roi signal, Roi contrast, BackgroundMeasure.Options o,
                                                   boolean allSlices) throws InputException {
        return Tables.toResultsTable(measureAutomaticAir(imp, signal, contrast, o, allSlices, null).rows());
    }

    /** The measurement behind {@link #processAutomaticAir}, with its notes and the air mask image. */
    public static Measurement measureAutomaticAir(ImagePlus imp, Roi signal, Roi contrast, BackgroundMeasure.Options o,
                                                  boolean allSlices, ImagePlus second) throws InputException {
        Face.checkImage(imp, TITLE);
        if (signal == null) {
            throw new InputException("There is no signal region: name a ROI Manager region 'signal', or draw a "
                    + "selection and choose 'Roles from: Selection is signal'.");
        }
        int[] planes = allSlices ? Planes.all(imp) : new int[] {imp.getCurrentSlice()};
        return BackgroundMeasure.run(imp, imp.getTitle(), RegionRoles.roles(List.of(signal), List.of(), contrast, imp)
                .withAutoAir(), o, planes, second, ImageJProgress.INSTANCE);
    }

    /** The measurement behind {@link #process}, with its notes. */
    public static Measurement measure(ImagePlus imp, Roi signal, List<Roi> background, Roi contrast,
                                      BackgroundMeasure.Options o, boolean allSlices, ImagePlus second)
            throws InputException {
        Face.checkImage(imp, TITLE);
        if (signal == null) {
            throw new InputException("There is no signal region: name a ROI Manager region 'signal', or draw a "
                    + "selection and choose 'Roles from: Selection is signal'.");
        }
        if (background.isEmpty()) {
            throw new InputException("There is no background region: add regions in air to the ROI Manager and name "
                    + "them 'background', 'bg', 'air' or 'noise', or choose 'Background: Automatic (all air)'.");
        }
        int[] planes = allSlices ? Planes.all(imp) : new int[] {imp.getCurrentSlice()};
        return BackgroundMeasure.run(imp, imp.getTitle(), RegionRoles.roles(List.of(signal), background, contrast, imp),
                o, planes, second, ImageJProgress.INSTANCE);
    }

    /**
     * SNR with sigma from a noise-only scan over the signal region's own pixels (no dialog; never modifies
     * {@code imp} or {@code scan}). Background regions, or automatic air, are optional: with them the
     * image's background sigma is compared with the scan's in the same pixels (a scan of another scale
     * gives no SNR).
     *
     * @param channels stated channel count, or null to estimate it from the scan
     * @param window   side of the sigma map's window, or 0 for no map
     */
    public static Measurement measureNoiseScan(ImagePlus imp, Roi signal, List<Roi> background, boolean autoAir,
                                               Roi contrast, Integer channels, boolean allSlices, ImagePlus scan,
                                               int window) throws InputException {
        Face.checkImage(imp, TITLE);
        if (scan == null) {
            throw new InputException("The noise-only scan is no longer open: open it and choose it again.");
        }
        Face.checkImage(scan, TITLE);
        if (signal == null) {
            throw new InputException("There is no signal region: name a ROI Manager region 'signal', or draw a "
                    + "selection and choose 'Roles from: Selection is signal'.");
        }
        int[] planes = allSlices ? Planes.all(imp) : new int[] {imp.getCurrentSlice()};
        org.noisewise.measure.Roles roles = RegionRoles.roles(List.of(signal), autoAir ? List.of() : background,
                contrast, imp);
        return NoiseScanMeasure.run(imp, imp.getTitle(), scan, scan.getTitle(), autoAir ? roles.withAutoAir() : roles,
                new NoiseScanMeasure.Options(channels, window > 0 ? window : NoiseScan.DEFAULT_WINDOW, window > 0),
                planes, ImageJProgress.INSTANCE);
    }

    /** The title of the table a first run on {@code imp} shows (later runs get unique titles). */
    public static String tableTitle(ImagePlus imp) {
        return TITLE + " - " + imp.getTitle();
    }
}
