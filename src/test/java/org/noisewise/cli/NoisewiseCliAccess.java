package org.noisewise.cli;

import java.util.List;

/** Test access to the command line's list of commands from other packages. */
public final class NoisewiseCliAccess {

    private NoisewiseCliAccess() {
    }

    public static List<Class<?>> commands() {
        return NoisewiseCli.COMMANDS;
    }
}
