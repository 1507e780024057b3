package org.noisewise.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.ImagePlus;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.protocol.Protocol;
import org.noisewise.testing.DicomEdit;

/**
 * The protocol read from DICOM tags, on pydicom's MR_small.dcm (Expat licence; see
 * src/test/resources/opendata/README.md) with the tags set by the test.
 */
class ProtocolHeadersTest {

    @TempDir
    Path dir;

    static byte[] resource(String name) throws Exception {
        try (InputStream in = ProtocolHeadersTest.class.getResourceAsStream("/opendata/" + name)) {
            return in.readAllBytes();
        }
    }

    /** MR_small with a full set of protocol tags (MR_small is 64 x 64 pixels). */
    static byte[] withProtocol(String type, double rInPlane) throws Exception {
        byte[] d = resource("MR_small.dcm");
        d = DicomEdit.set(d, 0x0018, 0x0023, "CS", type);
        d = DicomEdit.set(d, 0x0018, 0x0050, "DS", "5");
        d = DicomEdit.set(d, 0x0018, 0x0083, "DS", "2");
        d = DicomEdit.set(d, 0x0018, 0x0087, "DS", "1.5");
        d = DicomEdit.set(d, 0x0018, 0x0089, "IS", "48");
        d = DicomEdit.set(d, 0x0018, 0x0095, "DS", "130");
        d = DicomEdit.setUs(d, 0x0018, 0x1310, 64, 0, 0, 48);
        d = DicomEdit.set(d, 0x0018, 0x1312, "CS", "COL");
        if (rInPlane > 0) {
            d = DicomEdit.setFd(d, 0x0018, 0x9069, rInPlane);
        }
        return DicomEdit.set(d, 0x0028, 0x0030, "DS", "0.5\\0.5");
    }

    @Test
    void standardTagsGiveTheProtocol() throws Exception {
        Path f = dir.resolve("protocol.dcm");
        Files.write(f, withProtocol("2D", 0));
        ImagePlus imp = ImageFiles.open(f);
        Protocol p = ProtocolHeaders.of(imp);
        // acquired voxel from the acquisition matrix: 64 frequency x 48 phase over a 32 mm field of view,
        // phase along the columns (0018,1312 COL): 0.5 x (32/48) x 5 mm
        assertArrayEquals(new double[] {0.5, 32.0 / 48, 5}, p.voxel(), 1e-9);
        assertEquals(48.0, p.phase());
        assertEquals(2.0, p.averages());
        assertEquals(130.0, p.bandwidth());
        assertEquals(1.5, p.field());
        assertNull(p.partitions());
        assertNull(p.acceleration());
        assertEquals(48 * 2 / 130.0, p.samplingTime(), 1e-12);
        assertTrue(p.notes().stream().anyMatch(n -> n.contains("acquisition matrix")), p.notes().toString());
    }

    /**
     * Issue 23.4: every slice of a 3-D slab carries the whole slab's sampling time. One slice given
     * alone leaves the partitions unknown (never 1); a 40-file 3-D DICOM folder, or a 40-slice volume
     * without time frames, has 40; the out-of-plane phase steps (0018,9232) win when stated.
     */
    @Test
    void threeDPartitionsAndAcceleration() throws Exception {
        Path f = dir.resolve("accel.dcm");
        Files.write(f, withProtocol("3D", 2));
        Protocol p = ProtocolHeaders.of(ImageFiles.open(f));
        assertNull(p.partitions(), "one slice of a 3-D acquisition: partitions unknown");
        assertTrue(p.notes().stream().anyMatch(n -> n.contains("partitions is unknown")), p.notes().toString());
        assertEquals(2.0, p.acceleration());
        assertTrue(p.missingForEfficiency().stream().anyMatch(m -> m.contains("partitions")), p.missingForEfficiency()
                .toString());
        // a 40-file 3-D folder, as a scanner exports it
        DicomSeriesWriter.Spec spec = new DicomSeriesWriter.Spec("slab", 16, 16, 40, 1).geometry(1, 1, 1);
        for (int z = 0; z < 40; z++) {
            spec.image(z, 0, new short[256], 1, 0);
        }
        spec.common().text(0x00180023, "CS", "3D").integer(0x00180089, 256).decimals(0x00180083, 1)
                .decimals(0x00180095, 200).decimals(0x00180087, 3);
        Path folder = java.nio.file.Files.createDirectories(dir.resolve("slab"));
        for (DicomSeriesWriter.File file : DicomSeriesWriter.singleFrame(spec)) {
            Files.write(folder.resolve(file.name()), file.bytes());
        }
        Protocol slab = ProtocolHeaders.of(ImageFiles.open(folder));
        assertEquals(40.0, slab.partitions());
        // closed form: T = phase x partitions x averages / bandwidth
        assertEquals(256 * 40 / 200.0, slab.samplingTime(), 1e-12);
        assertTrue(slab.notes().stream().anyMatch(n -> n.contains("40 slices taken as the partitions")));
        assertTrue(slab.notes().stream().anyMatch(n -> n.contains("0018,0089")), "values read are named");
        // one 40-slice volume without time frames (a plain stack with the header)
        ImagePlus one = ImageFiles.open(folder.resolve("IM0001.dcm"));
        ij.ImageStack st = new ij.ImageStack(16, 16);
        for (int z = 0; z < 40; z++) {
            st.addSlice(new ij.process.ShortProcessor(16, 16));
        }
        ImagePlus volume = new ImagePlus("volume", st);
        volume.setProperty("Info", one.getProperty("Info"));
        assertEquals(40.0, ProtocolHeaders.of(volume).partitions());
        // out-of-plane phase steps stated: they win
        byte[] d = withProtocol("3D", 0);
        d = DicomEdit.setUs(d, 0x0018, 0x9232, 32);
        Path g = dir.resolve("oop.dcm");
        Files.write(g, d);
        assertEquals(32.0, ProtocolHeaders.of(ImageFiles.open(g)).partitions());
    }

    @Test
    void imagesWithoutHeadersStateNothing() throws Exception {
        Protocol p = ProtocolHeaders.of(new ImagePlus("plain", new ij.process.FloatProcessor(8, 8)));
        assertEquals("", p.text());
        assertEquals(4, p.missingForEfficiency().size());
    }
}
