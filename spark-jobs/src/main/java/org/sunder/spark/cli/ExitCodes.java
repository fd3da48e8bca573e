package org.sunder.spark.cli;

import java.io.PrintStream;
import java.util.List;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.spark.Launcher;
import org.sunder.spark.stage.TaskOutOfMemory;
import picocli.CommandLine;

/**
 * The exit codes of the command line ({@link #TABLE}, also in the README and in
 * {@code sunder --help}) and the mapping of failures to them: a {@link SunderException}
 * anywhere in the cause chain (also inside Spark's job failures) exits with its kind's code and
 * prints only its message, once; running out of memory, on the driver or in a task, exits with
 * {@value #OUT_OF_MEMORY} and a hint; anything else is an internal error, printed with its stack
 * trace, exit {@code 70}. Spark's own reports of failed tasks go to the log, not the terminal
 * ({@code bin/sunder-log4j2.properties}).
 */
public final class ExitCodes implements CommandLine.IExecutionExceptionHandler {
  /** Exit code when the driver or a task ran out of memory. */
  public static final int OUT_OF_MEMORY = 6;
  /** System property naming the log file that receives Spark's task failure reports. */
  public static final String LOG_FILE_PROPERTY = "sunder.logFile";

  /** One exit code and what it means. */
  public record Code(int code, String meaning) {}

  /** Every exit code of the command line, in increasing order. */
  public static final List<Code> TABLE = List.of(
      new Code(0, "success"),
      new Code(ErrorKind.INVALID_CONFIG.exitCode(), "invalid configuration or option, a block"
          + " too large for one array or for the memory, an output or work dir inside the input"
          + " container"),
      new Code(ErrorKind.INVALID_INPUT.exitCode(), "invalid input data: a missing, malformed"
          + " or empty dataset, a missing chunk, a corrupt chunk (truncated, wrong codec)"),
      new Code(ErrorKind.STORAGE.exitCode(), "storage failure: an I/O error such as missing"
          + " permissions or a full disk"),
      new Code(ErrorKind.CONFLICT.exitCode(), "conflict: the output or work dir belongs to"
          + " another run, or another live run holds the work dir"),
      new Code(OUT_OF_MEMORY, "out of memory: give each executor (or the driver) more memory,"
          + " or choose smaller blocks"),
      new Code(ErrorKind.INTERNAL.exitCode(), "internal error (please report it)"));

  private static final java.util.regex.Pattern TASK_TEXT = java.util.regex.Pattern.compile(
      TaskOutOfMemory.class.getSimpleName() + ": ([^\n]+)");

  private final PrintStream err;

  ExitCodes(PrintStream err) {
    this.err = err;
  }

  @Override
  public int handleExecutionException(Exception e, CommandLine line, CommandLine.ParseResult parsed) {
    return handle(e, line.getCommandName());
  }

  /** Prints what went wrong and returns the exit code; also for errors that bypass picocli. */
  int handle(Throwable e, String command) {
    SunderException known = find(e);
    if (known != null) {
      err.println(prefix(command) + ": " + known.getMessage());
      String log = System.getProperty(LOG_FILE_PROPERTY);
      if (log != null && known != e && viaSpark(e)) {
        err.println(prefix(command) + ": Spark's report of the failed task: " + log);
      }
      err.flush();
      return known.kind().exitCode();
    }
    String memory = outOfMemory(e);
    if (memory != null) {
      err.println(prefix(command) + ": out of memory: " + memory + "; give each executor"
          + " more memory (spark-submit --executor-memory, or SUNDER_JAVA_OPTS=-Xmx... with"
          + " bin/sunder), or choose smaller blocks (blocks.shape; '" + Launcher.command()
          + " plan CONFIG' shows the memory per partition task)");
      err.flush();
      return OUT_OF_MEMORY;
    }
    err.println(prefix(command) + ": internal error (please report it): " + e);
    e.printStackTrace(err);
    err.flush();
    return ErrorKind.INTERNAL.exitCode();
  }

  /** {@code "sunder run"}, or {@code "sunder"} outside any command. */
  private static String prefix(String command) {
    return command == null || command.isEmpty() || command.equals("sunder") ? "sunder"
        : "sunder " + command;
  }

  /** Whether a Spark job failure wraps {@code e}'s cause. */
  private static boolean viaSpark(Throwable e) {
    for (Throwable t = e; t != null && t.getCause() != t; t = t.getCause()) {
      if (t.getClass().getName().startsWith("org.apache.spark.")) {
        return true;
      }
    }
    return false;
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

  /**
   * What ran out of memory when the cause chain holds an {@link OutOfMemoryError} or a
   * {@link TaskOutOfMemory}, or Spark reports one only as text (a task of a lost executor, a
   * container that the cluster manager killed for its memory); else {@code null}.
   */
  static String outOfMemory(Throwable e) {
    for (Throwable t = e; t != null; t = t.getCause()) {
      if (t instanceof TaskOutOfMemory task) {
        return task.getMessage();
      }
      if (t instanceof OutOfMemoryError oom) {
        return "the driver ran out of memory (" + oom.getMessage() + ")";
      }
      String text = String.valueOf(t.getMessage());
      java.util.regex.Matcher task = TASK_TEXT.matcher(text);
      if (task.find()) {
        return task.group(1).trim();
      }
      if (text.contains("java.lang.OutOfMemoryError")
          || text.contains("exceeding memory limits")) {
        return "a task ran out of memory";
      }
      if (t.getCause() == t) {
        break;
      }
    }
    return null;
  }

  /** The table as the lines of the help footer. */
  static String[] footer() {
    String[] lines = new String[TABLE.size() + 2];
    lines[0] = "";
    lines[1] = "Exit codes:";
    for (int i = 0; i < TABLE.size(); i++) {
      lines[i + 2] = String.format(java.util.Locale.ROOT, "  %3d  %s", TABLE.get(i).code(),
          TABLE.get(i).meaning());
    }
    return lines;
  }

  static int usageError(CommandLine.ParameterException e, String[] args) {
    CommandLine line = e.getCommandLine();
    boolean top = line.getParent() == null;
    String prefix = top ? "sunder" : "sunder " + line.getCommandName();
    if (top && e instanceof CommandLine.UnmatchedArgumentException unmatched
        && !unmatched.getUnmatched().isEmpty() && !unmatched.getUnmatched().get(0).startsWith("-")) {
      line.getErr().println(prefix + ": unknown command '" + unmatched.getUnmatched().get(0)
          + "'; the commands are:");
      line.getErr().print(line.getHelp().commandList());
    } else {
      line.getErr().println(prefix + ": " + e.getMessage());
    }
    line.getErr().println("Try '" + Launcher.command() + " " + (top ? "" : line.getCommandName()
        + " ") + "--help' for usage.");
    line.getErr().flush();
    return ErrorKind.INVALID_CONFIG.exitCode();
  }
}
