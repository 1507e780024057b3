package org.noisewise.imagej;

import ij.ImagePlus;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.plugin.frame.RoiManager;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.RoiRegions;
import org.noisewise.io.RoleNames;

/**
 * The regions a command works on: the ROI Manager's regions (the selected ones, or all when none is
 * selected), each with a role from its name that the dialog can override ({@code region_N} macro
 * keys), and the image's active selection.
 */
final class RegionRoles {

    final Roi[] managed;
    final Roi selection;
    private RoleNames[] roles;

    private RegionRoles(Roi[] managed, Roi selection) {
        this.managed = managed;
        this.selection = selection;
        this.roles = new RoleNames[managed.length];
        for (int i = 0; i < managed.length; i++) {
            roles[i] = RoleNames.fromName(managed[i].getName());
        }
    }

    /** The ROI Manager's regions and the selection on {@code imp}. */
    static RegionRoles of(ImagePlus imp) {
        RoiManager rm = RoiManager.getInstance();
        Roi[] managed = rm == null ? new Roi[0] : rm.getSelectedRoisAsArray();
        Roi sel = imp == null ? null : imp.getRoi();
        return new RegionRoles(managed, sel != null && sel.isArea() ? sel : null);
    }

    /** The same regions and roles with the selection of another image (e.g. the first of two). */
    RegionRoles withSelectionOf(ImagePlus imp) {
        Roi sel = imp == null ? null : imp.getRoi();
        RegionRoles copy = new RegionRoles(managed, sel != null && sel.isArea() ? sel : null);
        copy.roles = roles.clone();
        return copy;
    }

    /** One choice per managed region, {@code Region_N (name)}, defaulting to the role its name implies. */
    void addFields(GenericDialog gd) {
        for (int i = 0; i < managed.length; i++) {
            gd.addChoice("Region_" + (i + 1) + " (" + RoiRegions.nameOf(managed[i], i) + "):", RoleNames.labels(),
                    roles[i].label());
        }
    }

    void readFields(GenericDialog gd) {
        for (int i = 0; i < managed.length; i++) {
            roles[i] = RoleNames.fromLabel(gd.getNextChoice());
        }
    }

    List<Roi> withRole(RoleNames role) {
        List<Roi> out = new ArrayList<>();
        for (int i = 0; i < managed.length; i++) {
            if (roles[i] == role) {
                out.add(managed[i]);
            }
        }
        return out;
    }

    boolean anyNamed(RoleNames role) {
        for (Roi r : managed) {
            if (RoleNames.fromName(r.getName()) == role) {
                return true;
            }
        }
        return false;
    }

    /**
     * Signal regions: those with the signal role; else the active selection; else, when no region
     * has any role, every managed region.
     */
    List<Roi> signalRegions() {
        List<Roi> sig = withRole(RoleNames.SIGNAL);
        if (!sig.isEmpty()) {
            return sig;
        }
        if (selection != null) {
            return List.of(selection);
        }
        if (withRole(RoleNames.BACKGROUND).isEmpty()) {
            return List.of(managed);
        }
        return List.of();
    }

    /**
     * Background regions: those with the background role; else, when no region has any role, every
     * managed region; else the active selection.
     */
    List<Roi> backgroundRegions() {
        List<Roi> bg = withRole(RoleNames.BACKGROUND);
        if (!bg.isEmpty()) {
            return bg;
        }
        if (managed.length > 0 && withRole(RoleNames.SIGNAL).isEmpty()) {
            return List.of(managed);
        }
        return selection == null ? List.of() : List.of(selection);
    }

    /** Core regions for the ROIs, checked against the image size. */
    static List<Region> toRegions(List<Roi> rois, String fallbackName, int width, int height) throws InputException {
        List<Region> out = new ArrayList<>();
        for (int i = 0; i < rois.size(); i++) {
            Roi r = rois.get(i);
            String name = r.getName() == null || r.getName().isBlank()
                    ? fallbackName + (rois.size() > 1 ? " " + (i + 1) : "") : r.getName();
            out.add(RoiRegions.toRegion(r, name, width, height));
        }
        return out;
    }
}
