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
        int status;
        PrintWriter out = new PrintWriter(System.out, true);
        // standard output carries the results alone: what a library prints there (ImageJ's error and log
        // messages in a process without windows) goes to standard error with the notes
        System.setOut(System.err);
        try {
            status = execute(args, out, new PrintWriter(System.err, true));
        } catch (OutOfMemoryError e) {
            // the heap was still full when the error was to be reported: the words made in advance
            System.err.println(OUT_OF_MEMORY);
            status = EXIT_INPUT;
        }
        System.exit(status);
    }

    /**
     * Memory set aside while a command runs and let go when the heap runs out, so that the message
     * saying so can be made and printed even if the heap is still full at that moment.
     */
    private static volatile byte[] reserve;

    /** Runs one command line with the given streams; returns the exit status. */
    public static int execute(String[] args, PrintWriter out, PrintWriter err) {
        // the words for a full heap are made while there is memory to make them
        String full = outOfMemoryText();
        reserve = new byte[1 << 20];
        try {
            return run(args, out, err);
        } catch (OutOfMemoryError e) {
            // reported here, where the command and all it read are no longer referenced and can be collected
            reserve = null;
            err.println(full);
            err.flush();
            return EXIT_INPUT;
        } finally {
            reserve = null;
        }
    }

    private static int run(String[] args, PrintWriter out, PrintWriter err) {
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
            if (ex.getCause() instanceof OutOfMemoryError full) {
                throw full; // reported by execute, once the command's data can be collected
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
        return cl.execute(args);
    }

    /** An input error's message with its remedy in the command line's words. */
    static String text(InputException e) {
        return e.remedy() == InputException.Remedy.REPLACE ? e.getMessage() + " or add --force to replace it"
                : e.getMessage();
    }

    /** What to do about a full heap: more heap, or less data at once. */
    private static final String MORE_MEMORY = "give Java more, e.g. java -Xmx8g -jar noisewise.jar ..., or measure "
            + "less at once (--slice N, a cropped image)";

    /** The line for a full heap without the heap's size, a constant (reporting may find the heap still full). */
    static final String OUT_OF_MEMORY = "noisewise: error: out of memory: " + MORE_MEMORY;

    /** One line for a full heap, with the heap's size. */
    static String outOfMemoryText() {
        return "noisewise: error: out of memory (" + Memory.heapText() + "): " + MORE_MEMORY;
    }
}
