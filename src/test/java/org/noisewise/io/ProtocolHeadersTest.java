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

    @Test
    void threeDAndAcceleration() throws Exception {
        Path f = dir.resolve("accel.dcm");
        Files.write(f, withProtocol("3D", 2));
        Protocol p = ProtocolHeaders.of(ImageFiles.open(f));
        assertEquals(1.0, p.partitions(), "a single slice of a 3-D acquisition: 1 partition in the image");
        assertEquals(2.0, p.acceleration());
        assertEquals(48 * 2 / 130.0 / 2, p.samplingTime(), 1e-12);
    }

    @Test
    void imagesWithoutHeadersStateNothing() throws Exception {
        Protocol p = ProtocolHeaders.of(new ImagePlus("plain", new ij.process.FloatProcessor(8, 8)));
        assertEquals("", p.text());
        assertEquals(4, p.missingForEfficiency().size());
    }
}
