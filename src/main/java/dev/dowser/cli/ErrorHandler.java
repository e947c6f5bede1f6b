package dev.dowser.cli;

import dev.dowser.data.ImportException;
import dev.dowser.store.StoreException;
import dev.dowser.web.PortBusyException;
import java.io.UncheckedIOException;
import picocli.CommandLine;
import picocli.CommandLine.IExecutionExceptionHandler;
import picocli.CommandLine.ParseResult;

/** Prints a failure as one plain sentence on standard error; a stack trace only for a bug. */
final class ErrorHandler implements IExecutionExceptionHandler {

    static final int EXIT_INPUT = 2;
    static final int EXIT_BUG = 70;

    @Override
    public int handleExecutionException(Exception e, CommandLine cl, ParseResult parsed) {
        var err = cl.getErr();
        if (e instanceof PortBusyException busy) {
            err.println("dowser: " + busy.getMessage() + "; choose another port with --port");
            return EXIT_INPUT;
        }
        if (e instanceof ImportException || e instanceof StoreException || e instanceof IllegalArgumentException
                || e instanceof UncheckedIOException) {
            err.println("dowser: " + e.getMessage());
            return EXIT_INPUT;
        }
        err.println("dowser: unexpected failure, please report it with the lines below");
        e.printStackTrace(err);
        return EXIT_BUG;
    }
}
