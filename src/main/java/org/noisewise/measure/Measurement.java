package org.noisewise.measure;

import ij.ImagePlus;
import ij.gui.Plot;
import java.util.ArrayList;
import java.util.List;
import org.noisewise.io.Arrangement;
import org.noisewise.io.ImagePlanes;
import org.noisewise.report.ResultRow;

/**
 * What a measurement produced: result rows (one per plane and region), new images (maps, corrected
 * copies; never the input), plots, and notes on every value chosen for the user (a channel count
 * estimated, a phase direction read from DICOM, a sigma measured), which the faces show.
 */
public record Measurement(List<ResultRow> rows, List<ImagePlus> images, List<Plot> plots, List<String> notes) {

    public Measurement {
        rows = List.copyOf(rows);
        images = List.copyOf(images);
        plots = List.copyOf(plots);
        notes = List.copyOf(notes);
    }

    /**
     * How a user cuts a mosaic the measurement took as it is. Only Fiji reaches this (the command line
     * cuts every DICOM mosaic it reads), so the words are Fiji's.
     */
    private static final String MOSAIC_CUT = "cut it into its slices with Plugins > Noisewise > Arrange Series...";

    /**
     * The notes every measurement starts with: how each input series was arranged as slices and
     * repeats, a Siemens mosaic measured as the image it is, and a colour lookup table on an input.
     */
    static List<String> imageNotes(ImagePlus... images) {
        List<String> notes = new ArrayList<>();
        for (ImagePlus imp : images) {
            if (imp == null) {
                continue;
            }
            String a = Arrangement.note(imp);
            // a single image needs no word on how it was arranged
            if (a != null && imp.getStackSize() > 1 && !notes.contains(a)) {
                notes.add(a);
            }
            String mosaic = Arrangement.mosaicNote(imp, MOSAIC_CUT);
            if (mosaic != null) {
                notes.add(mosaic);
            }
            String n = ImagePlanes.lookupTableNote(imp);
            if (n != null) {
                notes.add(n);
            }
        }
        return notes;
    }
}
