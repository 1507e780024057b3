package org.noisewise.testing;

import ij.ImagePlus;
import ij.ImageStack;
import ij.process.FloatProcessor;
import java.util.SplittableRandom;
import ij.io.FileSaver;
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
    /** K repeats of a 64x64 uniform square (A inside a 40x40 square) with per-column noise sigma(x). */
    public static ImagePlus squareSeries(String title, int k, double a, java.util.function.IntToDoubleFunction sigma, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        ImageStack st = new ImageStack(64, 64);
        for (int t = 0; t < k; t++) {
            float[] px = new float[64 * 64];
            for (int y = 0; y < 64; y++) {
                for (int x = 0; x < 64; x++) {
                    boolean in = x >= 12 && x < 52 && y >= 12 && y < 52;
                    px[y * 64 + x] = (float) NoiseFields.magnitude(rng, in ? a : 0, sigma.applyAsDouble(x), 1);
                }
            }
            st.addSlice(new FloatProcessor(64, 64, px));
        }
        return new ImagePlus(title, st);
    }

}
