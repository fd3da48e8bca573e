package org.sunder.spark.cli;

import java.lang.management.ManagementFactory;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/** The command line that runs Sunder's CLI in a new JVM with this JVM's class path. */
public final class ChildCli {
  private ChildCli() {}

  /**
   * {@code java -Xmx<heap> <this JVM's --add-opens/--add-exports/-Djdk.reflect flags>
   * <properties> -cp <class path> SunderCli <args>}.
   */
  public static List<String> command(String heap, List<String> properties, String... args) {
    List<String> command = new ArrayList<>();
    command.add(Path.of(System.getProperty("java.home"), "bin", "java").toString());
    command.add("-Xmx" + heap);
    for (String arg : ManagementFactory.getRuntimeMXBean().getInputArguments()) {
      if (arg.startsWith("--add-opens") || arg.startsWith("--add-exports")
          || arg.startsWith("-Djdk.reflect")) {
        command.add(arg);
      }
    }
    command.addAll(properties);
    command.add("-cp");
    command.add(System.getProperty("java.class.path"));
    command.add(SunderCli.class.getName());
    command.addAll(List.of(args));
    return command;
  }
}
