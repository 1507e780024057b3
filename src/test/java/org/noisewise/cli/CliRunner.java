package org.noisewise.cli;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import java.io.PrintWriter;
import java.io.StringWriter;

/** Runs the command line in-process and captures its streams. */
final class CliRunner {

    record Result(int status, String out, String err) {
    }

    private CliRunner() {
    }

    static Result run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int status = NoisewiseCli.execute(args, new PrintWriter(out), new PrintWriter(err));
        return new Result(status, out.toString(), err.toString());
    }

    /** The JSON object a successful run printed; fails (with its stderr) unless the exit status is 0. */
    static JsonObject json(Result r) {
        if (r.status() != 0) {
            throw new AssertionError("exit " + r.status() + ": " + r.err());
        }
        return JsonParser.parseString(r.out()).getAsJsonObject();
    }

    /** Whether a JSON {@code [low, high]} interval holds {@code truth}. */
    static boolean holds(JsonArray ci, double truth) {
        return ci.get(0).getAsDouble() <= truth && truth <= ci.get(1).getAsDouble();
    }

    /** Two argument lists one after the other (a command's own arguments, then shared regions). */
    static String[] concat(String[] a, String[] b) {
        String[] out = java.util.Arrays.copyOf(a, a.length + b.length);
        System.arraycopy(b, 0, out, a.length, b.length);
        return out;
    }
}
