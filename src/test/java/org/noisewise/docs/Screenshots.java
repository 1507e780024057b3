package org.noisewise.docs;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.Roi;
import ij.plugin.frame.RoiManager;
import java.awt.Rectangle;
import java.awt.Robot;
import java.awt.Window;
import java.awt.image.BufferedImage;
import java.io.File;
import java.nio.file.Files;
import java.nio.file.Path;
import javax.imageio.ImageIO;
import org.noisewise.sample.SampleCatalog;
import org.noisewise.sample.SampleCatalog.Rect;
import org.noisewise.testing.ImageJHarness;

/**
 * Makes the README's screenshots from the bundled samples: real ImageJ windows under a virtual
 * display, captured with {@link Robot}. Run by {@code docs/make-screenshots.sh}; not a test.
 */
public final class Screenshots {

    private static Path out;
    private static Robot robot;

    private Screenshots() {
    }

    public static void main(String[] args) throws Exception {
        out = Path.of(args.length > 0 ? args[0] : "docs/images");
        Files.createDirectories(out);
        ImageJHarness.start();
        robot = new Robot();
        RoiManager rm = RoiManager.getRoiManager();
        noiseScan(rm);
        if (args.length > 1 && args[1].equals("noise-scan")) {
            System.exit(0);
        }

        ImagePlus one = open("aster_disk_1ch.tif");
        rm.reset();
        add(rm, SampleCatalog.SIGNAL, "signal");
        for (int i = 0; i < SampleCatalog.BACKGROUND.size(); i++) {
            add(rm, SampleCatalog.BACKGROUND.get(i), "bg " + (i + 1));
        }
        one.show();
        IJ.run(one, "Set... ", "zoom=300");
        rm.runCommand(one, "Show All with labels");
        settle();
        capture(one.getWindow(), "background-regions.png");
        IJ.run(one, "SNR (Background Regions)...", "channels=1 estimator=[Maximum likelihood] slices=[Current slice] "
                + "roles=[Region names]");
        settle();
        capture(WindowManager.getWindow(org.noisewise.imagej.BackgroundSnrCommand.tableTitle(one)), "background-table.png");
        IJ.run(one, "Background Noise Check...", "channels=1 plot png=[]");
        settle();
        capture(startingWith("Background histogram"), "check-plot.png");
        capture(WindowManager.getWindow(org.noisewise.imagej.BackgroundCheckCommand.tableTitle(one)), "check-table.png");

        ImagePlus head = open(org.noisewise.sample.HeadSample.FILE);
        rm.reset();
        add(rm, org.noisewise.sample.HeadSample.SIGNAL, "signal");
        head.show();
        IJ.run(head, "Set... ", "zoom=300");
        IJ.run(head, "SNR (Background Regions)...", "channels=1 estimator=[Maximum likelihood] "
                + "slices=[Current slice] background=[Automatic (all air)]");
        rm.runCommand(head, "Show None");
        settle();
        capture(head.getWindow(), "automatic-air.png");
        head.changes = false;
        head.close();

        ImagePlus a = open("aster_disk_acq1.tif");
        ImagePlus b = open("aster_disk_acq2.tif");
        a.show();
        b.show();
        rm.reset();
        add(rm, SampleCatalog.SIGNAL, "signal");
        IJ.run(a, "SNR (Two Acquisitions)...", "source=[Two images] first=aster_disk_acq1.tif second=aster_disk_acq2.tif "
                + "frame_a=1 frame_b=2 channels=1 slices=[Current slice]");
        settle();
        capture(WindowManager.getWindow(org.noisewise.imagej.DifferenceSnrCommand.tableTitle(a)), "difference-table.png");

        ImagePlus rep = open("aster_disk_repeats.tif");
        rep.show();
        IJ.run(rep, "SNR Map (Repeated Acquisitions)...", "channels=1 slices=[Current slice] maps rician");
        settle();
        ImagePlus map = WindowManager.getImage("aster_disk_repeats.tif repeat maps");
        IJ.run(map, "Set... ", "zoom=300");
        IJ.run(map, "Fire", "");
        map.setDisplayRange(0, 4);
        map.updateAndDraw();
        settle();
        capture(map.getWindow(), "repeated-snr-map.png");
        capture(WindowManager.getWindow(org.noisewise.imagej.RepeatedSnrCommand.tableTitle(rep)), "repeated-table.png");

        ImagePlus low = open("aster_disk_low-snr.tif");
        low.show();
        IJ.run(low, "Rician Bias Correction...", "sigma=4 channels=1 method=[Koay-Basser (mean inversion)]");
        settle();
        ImagePlus corrected = WindowManager.getImage("aster_disk_low-snr.tif (bias-corrected)");
        IJ.run(corrected, "Set... ", "zoom=200");
        settle();
        capture(corrected.getWindow(), "corrected.png");
        Path shots = Files.createTempDirectory("noisewise-shots");
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            try (var files = Files.walk(shots)) {
                files.sorted(java.util.Comparator.reverseOrder()).forEach(f -> f.toFile().delete());
            } catch (java.io.IOException e) {
                System.err.println("could not remove " + shots + ": " + e.getMessage());
            }
        }));
        Path log = shots.resolve("qa.csv");
        ImagePlus qa1 = open("aster_disk_acq1.tif");
        ImagePlus qa2 = open("aster_disk_acq2.tif");
        qa1.show();
        qa2.show();
        IJ.run(qa1, "Phantom QA...", "second=aster_disk_acq2.tif regions=Automatic fraction=0.75 channels=1 "
                + "phase=Unknown limits field=1.5 scanner=Aster coil=head protocol=weekly baseline=5 log=[" + log
                + "] report=[] slice=1");
        IJ.run(qa1, "Set... ", "zoom=300");
        settle();
        capture(qa1.getWindow(), "qa-regions.png");
        capture(WindowManager.getWindow(org.noisewise.imagej.PhantomQaCommand.tableTitle(qa1)), "qa-table.png");

        ImagePlus avg2 = open("aster_avg2_series.tif");
        ImagePlus avg8 = open("aster_avg8_series.tif");
        avg2.show();
        avg8.show();
        rm.reset();
        Roi sig = new Roi(20, 20, 24, 24);
        sig.setName("signal");
        rm.addRoi(sig);
        IJ.run(avg2, "Compare Protocols...", "image_a=aster_avg2_series.tif image_b=aster_avg8_series.tif "
                + "protocol_a=[] protocol_b=[] field_exponent=1 channels=1 slices=[Current slice]");
        settle();
        capture(WindowManager.getWindow(org.noisewise.imagej.CompareProtocolsCommand.tableTitle(avg2)),
                "compare-table.png");
        ImagePlus full = open("aster_full_series.tif");
        ImagePlus acc = open("aster_accel2_series.tif");
        full.show();
        acc.show();
        rm.reset();
        Roi strip = new Roi(48, 20, 6, 24);
        strip.setName("signal");
        rm.addRoi(strip);
        IJ.run(full, "g-Factor Map...", "full=aster_full_series.tif accelerated=aster_accel2_series.tif acceleration=2 "
                + "window=5 channels=1 slices=[Current slice] map");
        settle();
        ImagePlus g = WindowManager.getImage("aster_accel2_series.tif g-factor");
        IJ.run(g, "Set... ", "zoom=400");
        IJ.run(g, "Fire", "");
        g.setDisplayRange(0.8, 1.8);
        g.updateAndDraw();
        settle();
        capture(g.getWindow(), "gfactor-map.png");
        capture(WindowManager.getWindow(org.noisewise.imagej.GFactorMapCommand.tableTitle(full)), "gfactor-table.png");
        System.exit(0);
    }

    /** The noise-only scan's sigma map of the accelerated sample, in a colour scale with its bar. */
    private static void noiseScan(RoiManager rm) throws Exception {
        ImagePlus scan = open(org.noisewise.sample.NoiseScanSample.NOISE);
        ImagePlus img = open(org.noisewise.sample.NoiseScanSample.IMAGE);
        scan.show();
        img.show();
        rm.reset();
        add(rm, org.noisewise.sample.NoiseScanSample.CENTRE, "signal");
        IJ.run(img, "SNR (Background Regions)...", "channels=auto estimator=[Maximum likelihood] "
                + "slices=[Current slice] roles=[Region names] second=None noise-only="
                + org.noisewise.sample.NoiseScanSample.NOISE + " sigma window=15");
        ImagePlus map = WindowManager.getImage(org.noisewise.sample.NoiseScanSample.IMAGE + " sigma map");
        IJ.run(map, "Fire", "");
        IJ.run(map, "Set... ", "zoom=300");
        IJ.run(map, "Calibration Bar...", "location=[Lower Right] fill=White label=Black number=3 decimal=1 "
                + "font=12 zoom=0.4 overlay");
        settle();
        capture(map.getWindow(), "noise-scan-sigma-map.png");
        map.changes = false;
        map.close();
        img.close();
        scan.close();
    }

    /** The newest window whose title starts with {@code prefix} (outputs get unique titles). */
    private static Window startingWith(String prefix) {
        Window found = null;
        for (java.awt.Frame f : java.awt.Frame.getFrames()) {
            if (f.isVisible() && f.getTitle() != null && f.getTitle().startsWith(prefix)) {
                found = f;
            }
        }
        return found;
    }

    private static ImagePlus open(String file) {
        ImagePlus imp = IJ.openImage(Path.of("sample-images", file).toString());
        if (imp == null) {
            throw new IllegalStateException("cannot open sample " + file);
        }
        return imp;
    }

    private static void add(RoiManager rm, Rect r, String name) {
        Roi roi = new Roi(r.x(), r.y(), r.w(), r.h());
        roi.setName(name);
        rm.addRoi(roi);
    }

    private static void settle() throws InterruptedException {
        IJ.wait(600);
        robot.waitForIdle();
    }

    private static void capture(Window w, String name) throws Exception {
        if (w == null) {
            throw new IllegalStateException("no window for " + name);
        }
        if (w instanceof ij.text.TextWindow) {
            w.setBounds(0, 0, 1500, 170);
            w.validate();
            settle();
        }
        w.toFront();
        settle();
        Rectangle r = w.getBounds();
        if (w instanceof ij.gui.ImageWindow iw && iw.getCanvas() != null) {
            // the image itself: without a window manager, ImageJ draws the window's title over its info line
            java.awt.Point p = iw.getCanvas().getLocationOnScreen();
            java.awt.Dimension d = iw.getCanvas().getSize();
            r = new Rectangle(p.x, p.y, d.width, d.height);
        }
        BufferedImage img = robot.createScreenCapture(r);
        ImageIO.write(img, "png", new File(out.resolve(name).toString()));
        System.out.println("wrote " + out.resolve(name) + " (" + r.width + "x" + r.height + ")");
    }
}
