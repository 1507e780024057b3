package org.noisewise.cli;

/** Test access to the command line's {@code --version} text from other packages. */
public final class CliRunnerAccess {

    private CliRunnerAccess() {
    }

    public static String version() {
        return CliRunner.run("--version").out();
    }
}
