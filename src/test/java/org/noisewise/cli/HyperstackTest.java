package org.noisewise.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import ij.ImagePlus;
import ij.ImageStack;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.noisewise.testing.TestImages;

/** Repeats along a hyperstack's time axis are taken per z slice (z fastest in ImageJ's stack order). */
class HyperstackTest {

    @TempDir
    Path dir;

    @Test
    void repeatsAndPairsPerZSlice() {
        int nz = 2;
        int nt = 5;
        ImageStack st = new ImageStack(TestImages.SIZE, TestImages.SIZE);
        for (int t = 0; t < nt; t++) {
            for (int z = 0; z < nz; z++) {
                // slice z=1 has noise sigma 3, z=2 sigma 6: the per-z results must tell them apart
                st.addSlice(TestImages.phantom("p", 100, z == 0 ? 3 : 6, 1, 100L * t + z).getProcessor());
            }
        }
        ImagePlus imp = new ImagePlus("hyper", st);
        imp.setDimensions(1, nz, nt);
        imp.setOpenAsHyperStack(true);
        Path file = TestImages.saveTiff(imp, dir, "hyper.tif");

        CliRunner.Result rep = CliRunner.run("repeat", file.toString(), "--signal", "38,38,20,20", "--json");
        assertEquals(0, rep.status(), rep.err());
        JsonArray rows = JsonParser.parseString(rep.out()).getAsJsonArray();
        assertEquals(nz, rows.size());
        JsonObject z1 = rows.get(0).getAsJsonObject();
        JsonObject z2 = rows.get(1).getAsJsonObject();
        assertEquals(nt, z1.get("repeats").getAsInt());
        assertEquals(3.0, z1.get("sigma").getAsDouble(), 0.3);
        assertEquals(6.0, z2.get("sigma").getAsDouble(), 0.6);

        CliRunner.Result diff = CliRunner.run("difference", file.toString(), "--frames", "1,4", "--signal",
                "38,38,20,20", "--slice", "2", "--json");
        assertEquals(0, diff.status(), diff.err());
        JsonObject d = JsonParser.parseString(diff.out()).getAsJsonObject();
        assertEquals(2, d.get("slice").getAsInt());
        assertEquals(6.0, d.get("sigma").getAsDouble(), 0.8);
        assertEquals(3, CliRunner.run("difference", file.toString(), "--frames", "1,6", "--signal", "38,38,20,20")
                .status());
    }
}
