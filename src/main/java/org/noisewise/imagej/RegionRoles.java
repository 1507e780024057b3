package org.noisewise.imagej;

import ij.ImagePlus;
import ij.gui.GenericDialog;
import ij.gui.Roi;
import ij.plugin.frame.RoiManager;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.noisewise.estimate.InputException;
import org.noisewise.estimate.Region;
import org.noisewise.io.RoiRegions;
import org.noisewise.io.RoleNames;
import org.noisewise.measure.Roles;

/**
 * The regions a command works on: the ROI Manager's regions (the selected ones, or all when none is
 * selected), each with the role its name implies, and the image's active selection.
 *
 * <p>Roles by name need no dialog field, so nothing about them is recorded and a recorded macro line
 * replays on the next image whatever the order of its regions. A region whose name implies no role
 * gets one choice, keyed by its name ({@code role_<name>}, non-alphanumerics as underscores), so a
 * recorded choice follows the region's name, not its position in the ROI Manager.
 */
final class RegionRoles {

    final Roi[] managed;
    final Roi selection;
    private final RoleNames[] roles;
    private final Map<Integer, String> keys = new LinkedHashMap<>();

    private RegionRoles(Roi[] managed, Roi selection) {
        this.managed = managed;
        this.selection = selection;
        this.roles = new RoleNames[managed.length];
        List<String> used = new ArrayList<>();
        for (int i = 0; i < managed.length; i++) {
            roles[i] = RoleNames.fromName(managed[i].getName());
            if (roles[i] == RoleNames.IGNORE) {
                String key = key(RoiRegions.nameOf(managed[i], i));
                String unique = key;
                for (int k = 2; used.contains(unique); k++) {
                    unique = key + "_" + k;
                }
                used.add(unique);
                keys.put(i, unique);
            }
        }
    }

    /** The ROI Manager's regions and the area selection on {@code imp}. */
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
        System.arraycopy(roles, 0, copy.roles, 0, roles.length);
        return copy;
    }

    /** The macro key of a region without a role: {@code role_} and its name with non-alphanumerics as underscores. */
    static String key(String name) {
        return "role_" + name.toLowerCase(Locale.ROOT).replaceAll("[^a-z0-9]+", "_").replaceAll("^_+|_+$", "");
    }

    /** One choice per region whose name implies no role (default: ignore). */
    void addFields(GenericDialog gd) {
        for (Map.Entry<Integer, String> e : keys.entrySet()) {
            gd.addChoice(capitalised(e.getValue()) + ":", RoleNames.labels(), RoleNames.IGNORE.label());
        }
    }

    void readFields(GenericDialog gd) {
        for (Integer i : keys.keySet()) {
            roles[i] = RoleNames.fromLabel(gd.getNextChoice());
        }
    }

    private static String capitalised(String key) {
        return Character.toUpperCase(key.charAt(0)) + key.substring(1);
    }

    boolean isEmpty() {
        return managed.length == 0 && selection == null;
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
            return withoutRole(RoleNames.CONTRAST);
        }
        return List.of();
    }

    /** The managed regions except those with {@code role}. */
    List<Roi> withoutRole(RoleNames role) {
        List<Roi> out = new ArrayList<>();
        for (int i = 0; i < managed.length; i++) {
            if (roles[i] != role) {
                out.add(managed[i]);
            }
        }
        return out;
    }

    /** The region with the contrast role, or null; more than one is refused. */
    Roi contrastRegion() throws InputException {
        List<Roi> c = withRole(RoleNames.CONTRAST);
        if (c.size() > 1) {
            throw new InputException("More than one ROI Manager region has the contrast role: keep one (rename the "
                    + "others, or give them another role).");
        }
        return c.isEmpty() ? null : c.get(0);
    }

    /**
     * Background regions: those with the background role; else, when no region has any role, every
     * managed region; else the active selection (when it is not the signal).
     */
    List<Roi> backgroundRegions() {
        List<Roi> bg = withRole(RoleNames.BACKGROUND);
        if (!bg.isEmpty()) {
            return bg;
        }
        if (managed.length > 0 && withRole(RoleNames.SIGNAL).isEmpty()) {
            return withoutRole(RoleNames.CONTRAST);
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

    /** The roles of a measurement from signal and background ROIs. */
    static Roles roles(List<Roi> signal, List<Roi> background, ImagePlus imp) throws InputException {
        return roles(signal, background, null, imp);
    }

    /** The roles of a measurement from signal, background and (nullable) contrast ROIs. */
    static Roles roles(List<Roi> signal, List<Roi> background, Roi contrast, ImagePlus imp) throws InputException {
        return new Roles(toRegions(signal, "signal", imp.getWidth(), imp.getHeight()),
                toRegions(background, "background", imp.getWidth(), imp.getHeight()),
                contrast == null ? List.of() : toRegions(List.of(contrast), "contrast", imp.getWidth(), imp.getHeight()));
    }
}
