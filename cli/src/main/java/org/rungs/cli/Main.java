package org.rungs.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;

/** The {@code rungs} command: a thin shell over the library; each subcommand calls one library method. */
@Command(name = "rungs",
        mixinStandardHelpOptions = true,
        versionProvider = VersionProvider.class,
        description = "Bayesian estimation for ratings given on scales: separates what respondents feel from how they use the scale.",
        subcommands = {FitCommand.class, DemoCommand.class, ReportCommand.class, CompareCommand.class, SimulateCommand.class, BenchmarkCommand.class, CalibrateCommand.class, RecoverCommand.class,
                CommandLine.HelpCommand.class})
public final class Main implements Runnable {
    /** Exit code for unusable input or options. */
    static final int INPUT_ERROR = 2;
    /** Exit code when the user interrupted a run (128 + SIGINT). */
    static final int INTERRUPTED = 130;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        spec.commandLine().usage(System.out);
    }

    public static void main(String[] args) {
        System.exit(commandLine().execute(args));
    }

    static CommandLine commandLine() {
        CommandLine cl = new CommandLine(new Main());
        cl.setParameterExceptionHandler((ex, args) -> {
            ex.getCommandLine().getErr().println("rungs: " + ex.getMessage());
            ex.getCommandLine().getErr().println("Try '" + ex.getCommandLine().getCommandSpec().qualifiedName() + " --help'.");
            return INPUT_ERROR;
        });
        // a file that cannot be read or written (a damaged checkpoint, a full disk) is a sentence, not
        // a stack trace; anything else escaping a command is a bug and keeps picocli's stack trace
        cl.setExecutionExceptionHandler((ex, commandLine, parseResult) -> {
            if (ex instanceof java.io.UncheckedIOException) {
                commandLine.getErr().println("rungs " + commandLine.getCommandName() + ": " + ex.getMessage());
                return INPUT_ERROR;
            }
            throw ex;
        });
        return cl;
    }
}
