package org.noisewise.cli;

import ij.gui.Roi;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.RoiRegions;
import org.noisewise.io.RoleNames;
import picocli.CommandLine.Option;

/** The region options shared by the commands: rectangles/ovals by coordinates and ImageJ ROI files. */
public class RegionOptions {

    @Option(names = "--signal", paramLabel = "x,y,w,h", converter = RegionConverter.class,
            description = "Signal region: rectangle x,y,w,h in pixels (top-left corner, as ImageJ reports it) "
                    + "or oval:x,y,w,h.")
    RegionSpec signal;

    @Option(names = "--background", paramLabel = "x,y,w,h", converter = RegionConverter.class,
            description = "Background region in air; repeat for several regions (pooled).")
    List<RegionSpec> background = new ArrayList<>();

    @Option(names = "--rois", paramLabel = "FILE",
            description = "ImageJ ROI file (.roi or ROI Manager .zip); roles by name: signal..., "
                    + "background.../bg.../air.../noise...")
    Path rois;

    /** The signal region and background regions, checked against the image size. */
    public record Resolved(Region signal, List<Region> background) {
    }

    Resolved resolve(int width, int height) throws InputException {
        Region sig = null;
        List<Region> bg = new ArrayList<>();
        if (rois != null) {
            List<Roi> list = RoiRegions.read(rois);
            for (int i = 0; i < list.size(); i++) {
                Roi r = list.get(i);
                String name = RoiRegions.nameOf(r, i);
                RoleNames role = RoleNames.fromName(r.getName());
                if (role == RoleNames.SIGNAL && signal == null) {
                    if (sig != null) {
                        throw new InputException("ROI file '" + rois + "' has more than one region named signal...: keep one");
                    }
                    sig = RoiRegions.toRegion(r, name, width, height);
                } else if (role == RoleNames.BACKGROUND) {
                    bg.add(RoiRegions.toRegion(r, name, width, height));
                }
            }
        }
        if (signal != null) {
            sig = signal.toRegion("signal", width, height);
        }
        for (int i = 0; i < background.size(); i++) {
            bg.add(background.get(i).toRegion("background " + (i + 1), width, height));
        }
        return new Resolved(sig, bg);
    }

    static InputException noSignal() {
        return new InputException("no signal region: give --signal x,y,w,h or a ROI file with a region named 'signal'");
    }

    static InputException noBackground() {
        return new InputException("no background region: give --background x,y,w,h (in air, clear of the object "
                + "and of ghosts) or a ROI file with regions named 'background...'");
    }
}
