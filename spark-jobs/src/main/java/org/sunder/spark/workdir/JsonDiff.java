package org.sunder.spark.workdir;

import com.fasterxml.jackson.databind.JsonNode;
import java.util.List;
import java.util.TreeSet;

/** Lists the key paths at which two JSON trees differ, with old and new values. */
final class JsonDiff {
  private JsonDiff() {}

  static void diff(String path, JsonNode before, JsonNode after, List<String> out) {
    if (before != null && after != null && before.isObject() && after.isObject()) {
      TreeSet<String> keys = new TreeSet<>();
      before.fieldNames().forEachRemaining(keys::add);
      after.fieldNames().forEachRemaining(keys::add);
      for (String key : keys) {
        diff(path.isEmpty() ? key : path + "." + key, before.get(key), after.get(key), out);
      }
      return;
    }
    if (!equal(before, after)) {
      out.add(path + ": " + show(before) + " -> " + show(after));
    }
  }

  private static boolean equal(JsonNode a, JsonNode b) {
    if (a == null || a.isNull()) {
      return b == null || b.isNull();
    }
    if (a.isIntegralNumber() && b != null && b.isIntegralNumber()) {
      return a.bigIntegerValue().equals(b.bigIntegerValue()); // int read back vs long written
    }
    return a.equals(b);
  }

  private static String show(JsonNode node) {
    if (node == null || node.isNull()) {
      return "(unset)";
    }
    String text = node.toString();
    return text.length() > 80 ? text.substring(0, 77) + "..." : text;
  }

}
