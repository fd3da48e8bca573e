package org.sunder.testing;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;

import org.junit.jupiter.api.Test;

class PythonReferenceTest {

  @Test
  void runsAScriptWithArgumentsAndReportsItsExitCode() {
    PythonReference.requireModules("json");
    assertEquals("7\n", PythonReference.runChecked("import sys; print(int(sys.argv[1]) + 4)", "3"));
    assertNotEquals(0, PythonReference.run("raise SystemExit(3)").exitCode());
  }
}
