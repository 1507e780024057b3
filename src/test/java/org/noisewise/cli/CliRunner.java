package org.noisewise.cli;

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
}
