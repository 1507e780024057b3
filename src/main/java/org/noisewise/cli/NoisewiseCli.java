package org.noisewise.cli;

import java.io.PrintWriter;
import org.noisewise.estimate.InputException;
import org.noisewise.measure.Memory;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * The command-line face: {@code java -jar target/noisewise.jar COMMAND ...}. Exit status 0 on
 * success, 2 for a usage error, 3 for an input error or a full Java heap (one line on stderr saying
 * what is wrong and what to do), 1 for an internal error.
 */
@Command(name = "noisewise", mixinStandardHelpOptions = true, versionProvider = Version.class,
        description = {"Corrected noise and SNR measurement for MR magnitude images.",
                "For image-quality QA and research; not a diagnostic device. Where results feed acceptance or "
                        + "safety decisions, defer to your site's qualified medical physicist and local regulations."})
public class NoisewiseCli implements Runnable {

    /** The subcommands, in the order the help lists them. */
    static final java.util.List<Class<?>> COMMANDS = java.util.List.of(BackgroundCommand.class,
            DifferenceCommand.class, RepeatCommand.class, CheckCommand.class, CorrectCommand.class, QaCommand.class,
            StabilityCommand.class, PredictCommand.class, CompareCommand.class, GFactorCommand.class,
            BatchCommand.class, DemoCommand.class, GenerateSamplesCommand.class);

    public static final int EXIT_INPUT = 3;
    public static final int EXIT_INTERNAL = 1;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }

    public static void main(String[] args) {
        System.setProperty("java.awt.headless", "true");
        System.exit(execute(args, new PrintWriter(System.out, true), new PrintWriter(System.err, true)));
    }

    /** Runs one command line with the given streams; returns the exit status. */
    public static int execute(String[] args, PrintWriter out, PrintWriter err) {
        CommandLine cl = new CommandLine(new NoisewiseCli());
        // a command line naming one command sets up only that one (a faster start); otherwise all of them
        Class<?> named = null;
        if (args.length > 0) {
            for (Class<?> c : COMMANDS) {
                if (c.getAnnotation(Command.class).name().equals(args[0])) {
                    named = c;
                }
            }
        }
        for (Class<?> c : COMMANDS) {
            if (named == null || c == named) {
                cl.addSubcommand(c.getAnnotation(Command.class).name(), c);
            }
        }
        cl.addSubcommand("help", new CommandLine.HelpCommand());
        cl.setOut(out);
        cl.setErr(err);
        cl.setExecutionExceptionHandler((ex, commandLine, parseResult) -> {
            if (ex.getCause() instanceof OutOfMemoryError) {
                return outOfMemory(err);
            }
            if (ex instanceof InputException ie) {
                err.println("noisewise: error: " + text(ie));
                err.flush();
                return EXIT_INPUT;
            }
            err.println("noisewise: internal error (" + ex.getClass().getSimpleName() + ": " + ex.getMessage()
                    + "); please report it with the command you ran");
            err.flush();
            return EXIT_INTERNAL;
        });
        cl.setParameterExceptionHandler((ex, a) -> {
            err.println("noisewise: " + ex.getMessage() + " (see --help)");
            err.flush();
            return CommandLine.ExitCode.USAGE;
        });
        try {
            return cl.execute(args);
        } catch (OutOfMemoryError e) {
            return outOfMemory(err);
        }
    }

    /** An input error's message with its remedy in the command line's words. */
    static String text(InputException e) {
        return e.remedy() == InputException.Remedy.REPLACE ? e.getMessage() + " or add --force to replace it"
                : e.getMessage();
    }

    /** One line for a full heap (what to do: more heap, or less data at once); exit status 3. */
    static int outOfMemory(PrintWriter err) {
        err.println("noisewise: error: out of memory (" + Memory.heapText() + "): give Java more, e.g. "
                + "java -Xmx8g -jar noisewise.jar ..., or measure less at once (--slice N, a cropped image)");
        err.flush();
        return EXIT_INPUT;
    }
}
