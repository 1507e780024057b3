package org.noisewise.cli;

import ij.gui.Roi;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.RoiRegions;
import org.noisewise.io.RoleNames;
import org.noisewise.measure.Roles;
import picocli.CommandLine.Option;

/** The region options shared by the commands: rectangles/ovals by coordinates and ImageJ ROI files. */
public class RegionOptions {

    @Option(names = "--signal", paramLabel = "x,y,w,h", converter = RegionConverter.class,
            description = "Signal region: rectangle x,y,w,h in pixels (top-left corner, as ImageJ reports it) "
                    + "or oval:x,y,w,h; repeat for several (difference, repeat).")
    List<RegionSpec> signal = new ArrayList<>();

    @Option(names = "--background", paramLabel = "x,y,w,h", converter = RegionConverter.class,
            description = "Background region in air; repeat for several regions (pooled). Or auto: every pixel "
                    + "of pure noise, found in each slice (background, check, batch).")
    List<RegionSpec> background = new ArrayList<>();

    @Option(names = "--contrast", paramLabel = "x,y,w,h", converter = RegionConverter.class,
            description = "Contrast region (a second tissue) for the contrast-to-noise ratio: adds cnr, its "
                    + "interval and the contrast amplitude (background, difference, repeat).")
    List<RegionSpec> contrast = new ArrayList<>();

    @Option(names = "--rois", paramLabel = "FILE",
            description = "ImageJ ROI file (.roi or ROI Manager .zip); roles by name: signal..., "
                    + "background.../bg.../air.../noise..., contrast...")
    Path rois;

    /** The regions by role, checked against the image size. */
    Roles resolve(int width, int height) throws InputException {
        List<Region> sig = new ArrayList<>();
        List<Region> bg = new ArrayList<>();
        List<Region> con = new ArrayList<>();
        if (rois != null) {
            List<Roi> list = RoiRegions.read(rois);
            for (int i = 0; i < list.size(); i++) {
                Roi r = list.get(i);
                String name = RoiRegions.nameOf(r, i);
                RoleNames role = RoleNames.fromName(r.getName());
                if (role == RoleNames.SIGNAL && signal.isEmpty()) {
                    sig.add(RoiRegions.toRegion(r, name, width, height));
                } else if (role == RoleNames.BACKGROUND) {
                    bg.add(RoiRegions.toRegion(r, name, width, height));
                } else if (role == RoleNames.CONTRAST && contrast.isEmpty()) {
                    con.add(RoiRegions.toRegion(r, name, width, height));
                }
            }
        }
        for (int i = 0; i < signal.size(); i++) {
            sig.add(signal.get(i).toRegion(signal.size() > 1 ? "signal " + (i + 1) : "signal", width, height));
        }
        boolean auto = background.stream().anyMatch(RegionSpec::auto);
        if (auto && (background.size() > 1 || !bg.isEmpty())) {
            throw new InputException("--background auto stands alone: give either auto or background regions "
                    + "(rectangles, or regions named 'background...' in the ROI file), not both");
        }
        for (int i = 0; i < background.size() && !auto; i++) {
            bg.add(background.get(i).toRegion("background " + (i + 1), width, height));
        }
        for (int i = 0; i < contrast.size(); i++) {
            con.add(contrast.get(i).toRegion(contrast.size() > 1 ? "contrast " + (i + 1) : "contrast", width, height));
        }
        Roles roles = new Roles(sig, bg, con);
        return auto ? roles.withAutoAir() : roles;
    }

    /** Refuses {@code --background auto} where the method needs regions drawn by hand. */
    void refuseAutoAir(String command) throws InputException {
        if (background.stream().anyMatch(RegionSpec::auto)) {
            throw new InputException("--background auto is not used by " + command + ": automatic air comes with the "
                    + "background and check methods; give background regions as x,y,w,h");
        }
    }

    /** Refuses {@code --contrast} where the method has no contrast-to-noise ratio (it would be ignored). */
    void refuseContrast(String command) throws InputException {
        if (!contrast.isEmpty()) {
            throw new InputException("--contrast is not used by " + command + ": the contrast-to-noise ratio comes with "
                    + "the background, difference and repeat methods; leave --contrast out");
        }
    }

    /** Fails with the command line's wording when a needed role is missing. */
    static void require(Roles roles, boolean signal, boolean oneSignal, boolean background) throws InputException {
        if (signal && roles.signal().isEmpty()) {
            throw noSignal();
        }
        if (oneSignal && roles.signal().size() > 1) {
            throw new InputException(roles.signal().size() + " signal regions were given: this method measures one; "
                    + "give a single --signal (or one region named signal in the ROI file)");
        }
        if (background && roles.background().isEmpty() && !roles.autoAir()) {
            throw noBackground();
        }
    }

    static InputException noSignal() {
        return new InputException("no signal region: give --signal x,y,w,h or a ROI file with a region named 'signal'");
    }

    static InputException noBackground() {
        return new InputException("no background region: give --background x,y,w,h (in air, clear of the object "
                + "and of ghosts) or a ROI file with regions named 'background...'");
    }
}
