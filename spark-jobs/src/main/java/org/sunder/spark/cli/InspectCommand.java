package org.sunder.spark.cli;

import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.sunder.stitching.inspect.ContainerReport;
import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.ParentCommand;

/** {@code sunder inspect CONTAINER [PATH]}. */
@Command(name = "inspect", mixinStandardHelpOptions = true,
    description = {"Show what an N5 or Zarr container holds: groups and datasets with shape,"
        + " chunks (slowest axis first), data type, codec and attributes. Reads no chunk data."})
final class InspectCommand implements Callable<Integer> {
  @ParentCommand
  SunderCli cli;

  @Parameters(index = "0", paramLabel = "CONTAINER", description = "N5 or Zarr container directory.")
  Path container;

  @Parameters(index = "1", arity = "0..1", paramLabel = "PATH",
      description = "One dataset or group inside it (default: everything).")
  String path;

  @Override
  public Integer call() {
    ContainerReport.print(container, path, cli.out());
    return 0;
  }
}
