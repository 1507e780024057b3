package org.noisewise.testing;

import ij.ImagePlus;
import ij.io.FileSaver;
import ij.process.FloatProcessor;
import ij.process.ImageProcessor;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.nio.ByteBuffer;
import org.noisewise.sample.Phantoms;

/** Generated test images (demo-style data with known truth) and pixel checksums. */
public final class TestImages {

    public static final int SIZE = 96;

    private TestImages() {
    }

    /** A 96x96 disk phantom, radius 28 at the centre; signal box 38,38,20,20; air boxes at the corners. */
    public static ImagePlus phantom(String title, double amplitude, double sigma, int channels, long seed) {
        float[] px = Phantoms.disk(SIZE, SIZE, 48, 48, 28, amplitude, sigma, channels, seed);
        return new ImagePlus(title, new FloatProcessor(SIZE, SIZE, px));
    }

    public static Path saveTiff(ImagePlus imp, Path dir, String name) {
        Path p = dir.resolve(name);
        if (!new FileSaver(imp).saveAsTiff(p.toString())) {
            throw new IllegalStateException("could not write " + p);
        }
        return p;
    }

    /** SHA-256 over every slice's pixel values. */
    public static String checksum(ImagePlus imp) {
        try {
            MessageDigest md = MessageDigest.getInstance("SHA-256");
            for (int n = 1; n <= imp.getStackSize(); n++) {
                ImageProcessor ip = imp.getStack().getProcessor(n);
                ByteBuffer b = ByteBuffer.allocate(4 * ip.getPixelCount());
                for (int i = 0; i < ip.getPixelCount(); i++) {
                    b.putFloat(ip.getf(i));
                }
                md.update(b.array());
            }
            StringBuilder sb = new StringBuilder();
            for (byte x : md.digest()) {
                sb.append(String.format("%02x", x));
            }
            return sb.toString();
        } catch (java.security.NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }
}
