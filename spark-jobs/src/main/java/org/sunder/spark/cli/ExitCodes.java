package org.sunder.spark.cli;

import java.io.PrintStream;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import picocli.CommandLine;

/**
 * Maps failures to exit codes: a {@link SunderException} anywhere in the cause chain (also
 * inside Spark's job failures) exits with its kind's code and prints only its message; anything
 * else is an internal error, printed with its stack trace, exit {@code 70}.
 */
final class ExitCodes implements CommandLine.IExecutionExceptionHandler {
  private final PrintStream err;

  ExitCodes(PrintStream err) {
    this.err = err;
  }

  @Override
  public int handleExecutionException(Exception e, CommandLine line, CommandLine.ParseResult parsed) {
    SunderException known = find(e);
    if (known != null) {
      err.println("sunder " + line.getCommandName() + ": " + known.getMessage());
      err.flush();
      return known.kind().exitCode();
    }
    err.println("sunder " + line.getCommandName() + ": internal error (please report it): " + e);
    e.printStackTrace(err);
    err.flush();
    return ErrorKind.INTERNAL.exitCode();
  }

  /** The first {@link SunderException} in the cause chain, or {@code null}. */
  static SunderException find(Throwable e) {
    for (Throwable t = e; t != null; t = t.getCause()) {
      if (t instanceof SunderException s) {
        return s;
      }
      if (t.getCause() == t) {
        break;
      }
    }
    return null;
  }

  static int usageError(CommandLine.ParameterException e, String[] args) {
    CommandLine line = e.getCommandLine();
    line.getErr().println("sunder " + line.getCommandName() + ": " + e.getMessage());
    line.getErr().println("Try 'sunder " + (line.getParent() == null ? "" : line.getCommandName()
        + " ") + "--help' for usage.");
    line.getErr().flush();
    return ErrorKind.INVALID_CONFIG.exitCode();
  }
}
