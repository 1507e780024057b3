package org.noisewise.imagej;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;
import ij.plugin.frame.RoiManager;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.diagnose.PhaseDirection;
import org.noisewise.estimate.BackgroundSnr;
import org.noisewise.estimate.BackgroundSnrResult;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.estimate.SigmaEstimator;
import org.noisewise.io.BackgroundValues;
import org.noisewise.io.ImagePlanes;
import org.noisewise.io.RoiRegions;
import org.noisewise.io.RoleNames;
import org.noisewise.report.BackgroundSnrRows;
import org.noisewise.report.ResultRow;

/**
 * {@code Plugins>Noisewise>SNR (Background Regions)...}: the single-image SNR with the background
 * sigma corrected for the Rayleigh / chi(2L) distribution of magnitude noise.
 *
 * <p>Macro keys: {@code channels} (L, or {@code auto} to estimate the effective count), {@code estimator} ([Maximum likelihood], [Mean-based],
 * [SD-based], [Median-based]), {@code slices} ([Current slice] or [All slices]), {@code roles}
 * ([Region names] or [Selection is signal]), {@code phase} ([Rows (ghosts left/right)],
 * [Columns (ghosts above/below)] or [Unknown]; default from DICOM 0018,1312), and, with region names, {@code region_1},
 * {@code region_2}, ... (signal, background or ignore) to override the role a name implies.
 * Example: {@code run("SNR (Background Regions)...", "channels=1 estimator=[Maximum likelihood]
 * slices=[Current slice] roles=[Region names]");}
 */
public class BackgroundSnrCommand implements PlugIn {

    static final String TITLE = "SNR (Background Regions)";
    static final String CURRENT = "Current slice";
    static final String ALL = "All slices";
    static final String BY_NAME = "Region names";
    static final String BY_SELECTION = "Selection is signal";
    static final String HELP = "<html><b>SNR (Background Regions)</b><br>"
            + "Signal region: a ROI Manager region named <i>signal...</i> (or the active selection).<br>"
            + "Background regions: regions named <i>background..., bg..., air...</i> or <i>noise...</i>, in air, "
            + "clear of the object and of ghosts.<br>Channels: number of receive channels combined by root sum "
            + "of squares (1 for a single-channel or phase-array image reconstructed to one channel).<br>"
            + "See the README section 'SNR (Background Regions)' for the method and its limits.</html>";

    @Override
    public void run(String arg) {
        ImagePlus imp = WindowManager.getCurrentImage();
        if (imp == null) {
            IJ.noImage();
            return;
        }
        RoiManager rm = RoiManager.getInstance();
        Roi[] managed = rm == null ? new Roi[0] : rm.getSelectedRoisAsArray();
        Roi selection = imp.getRoi();

        GenericDialog gd = new GenericDialog(TITLE);
        DialogFields.addChannels(gd);
        gd.addChoice("Estimator:", SigmaEstimator.labels(), SigmaEstimator.ML.label());
        gd.addChoice("Slices:", new String[] {CURRENT, ALL}, CURRENT);
        boolean named = hasSignalName(managed);
        String defaultRoles = !named && selection != null && selection.isArea() ? BY_SELECTION : BY_NAME;
        gd.addChoice("Roles from:", new String[] {BY_NAME, BY_SELECTION}, defaultRoles);
        DialogFields.addPhase(gd, imp);
        for (int i = 0; i < managed.length; i++) {
            String name = RoiRegions.nameOf(managed[i], i);
            gd.addChoice("Region_" + (i + 1) + " (" + name + "):", RoleNames.labels(),
                    RoleNames.fromName(managed[i].getName()).label());
        }
        gd.addHelp(HELP);
        gd.showDialog();
        if (gd.wasCanceled()) {
            return;
        }
        String channelText = gd.getNextString();
        SigmaEstimator estimator = SigmaEstimator.parse(gd.getNextChoice());
        boolean all = ALL.equals(gd.getNextChoice());
        boolean bySelection = BY_SELECTION.equals(gd.getNextChoice());
        PhaseDirection phase = DialogFields.nextPhase(gd);
        RoleNames[] roles = new RoleNames[managed.length];
        for (int i = 0; i < managed.length; i++) {
            roles[i] = RoleNames.fromLabel(gd.getNextChoice());
        }
        try {
            Integer channels = DialogFields.parseChannels(channelText);
            Roi signal;
            List<Roi> background = new ArrayList<>();
            if (bySelection) {
                if (selection == null || !selection.isArea()) {
                    throw new InputException("no area selection on the image: draw the signal region, "
                            + "or choose 'Roles from: Region names'");
                }
                signal = selection;
                background.addAll(List.of(managed));
            } else {
                signal = null;
                for (int i = 0; i < managed.length; i++) {
                    if (roles[i] == RoleNames.SIGNAL) {
                        if (signal != null) {
                            throw new InputException("more than one region has the signal role: keep one "
                                    + "(rename the others or set them to background or ignore)");
                        }
                        signal = managed[i];
                    } else if (roles[i] == RoleNames.BACKGROUND) {
                        background.add(managed[i]);
                    }
                }
            }
            ResultsTable rt = process(imp, signal, background,
                    new BackgroundSnr.Options(channels, estimator, phase, BackgroundValues.storage(imp)), all);
            rt.show(tableTitle(imp));
        } catch (InputException e) {
            IJ.error(TITLE, e.getMessage());
        } catch (RuntimeException e) {
            Errors.unexpected(TITLE, e);
        }
    }

    /** The table's window title for this image. */
    public static String tableTitle(ImagePlus imp) {
        return "SNR background - " + imp.getTitle();
    }

    /**
     * Measures the image without any dialog (for scripts and tests). Never modifies {@code imp}.
     *
     * @return a table with one row per measured slice
     */
    public static ResultsTable process(ImagePlus imp, Roi signal, List<Roi> background,
                                       BackgroundSnr.Options options, boolean allSlices) throws InputException {
        List<ResultRow> rows = measure(imp, signal, background, options, allSlices);
        return Tables.toResultsTable(rows);
    }

    /** The rows of {@link #process}, one per slice. */
    public static List<ResultRow> measure(ImagePlus imp, Roi signal, List<Roi> background,
                                          BackgroundSnr.Options options, boolean allSlices) throws InputException {
        ImagePlanes.requireGrayscale(imp);
        if (signal == null) {
            throw new InputException("no signal region: name a ROI Manager region 'signal' or draw a "
                    + "selection and choose 'Roles from: Selection is signal'");
        }
        if (background.isEmpty()) {
            throw new InputException("no background region: add regions in air to the ROI Manager and "
                    + "name them 'background', 'bg', 'air' or 'noise'");
        }
        int w = imp.getWidth();
        int h = imp.getHeight();
        Region sig = RoiRegions.toRegion(signal, signal.getName() == null ? "signal" : signal.getName(), w, h);
        List<Region> bg = new ArrayList<>();
        for (int i = 0; i < background.size(); i++) {
            Roi r = background.get(i);
            bg.add(RoiRegions.toRegion(r, RoiRegions.nameOf(r, i), w, h));
        }
        int first = allSlices ? 1 : imp.getCurrentSlice();
        int last = allSlices ? imp.getStackSize() : imp.getCurrentSlice();
        String unit = ImagePlanes.valueUnit(imp);
        List<ResultRow> rows = new ArrayList<>();
        for (int n = first; n <= last; n++) {
            if (last > first) {
                IJ.showProgress(n - first, last - first + 1);
            }
            float[] px = ImagePlanes.calibratedPixels(imp, n);
            BackgroundSnrResult r = BackgroundSnr.analyze(px, w, h, sig, bg, options);
            rows.add(BackgroundSnrRows.row(imp.getTitle(), n, unit, r));
        }
        IJ.showProgress(1.0);
        return rows;
    }

    private static boolean hasSignalName(Roi[] rois) {
        for (Roi r : rois) {
            if (RoleNames.fromName(r.getName()) == RoleNames.SIGNAL) {
                return true;
            }
        }
        return false;
    }
}
