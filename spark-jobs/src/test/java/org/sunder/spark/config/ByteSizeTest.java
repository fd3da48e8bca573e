package org.sunder.spark.config;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.spark.network.util.JavaUtils;
import org.junit.jupiter.api.Test;

class ByteSizeTest {
  @Test
  void sizeStringsMeanWhatSparksMemorySettingsMean() {
    // Reference: Spark's own parser of memory settings (JavaUtils.byteStringAsBytes), which
    // reads "4g" as 4 x 2^30 bytes and a bare number as bytes.
    for (String text : new String[] {"4g", "512m", "1536k", "2gb", "100b", "3G", "7", "1t"}) {
      assertEquals(JavaUtils.byteStringAsBytes(text), ByteSize.parse(text).bytes(), text);
    }
    Random random = new Random(13);
    String[] units = {"", "b", "k", "kb", "m", "mb", "g", "gb"};
    for (int i = 0; i < 200; i++) {
      String text = (1 + random.nextInt(5000)) + units[random.nextInt(units.length)];
      assertEquals(JavaUtils.byteStringAsBytes(text), ByteSize.parse(text).bytes(), text);
    }
  }

  @Test
  void theConfigurationTakesBytesOrAStringAndNamesTheKeyOfABadValue() {
    ConfigReader reader = new ConfigReader();
    RunConfig bytes = reader.parse("{\"input\": {\"container\": \"v.zarr\"},"
        + " \"blocks\": {\"memoryPerTask\": 1073741824}}");
    assertEquals(1L << 30, bytes.blocks().memoryPerTask().bytes());
    RunConfig text = reader.parse("{\"input\": {\"container\": \"v.zarr\"},"
        + " \"blocks\": {\"memoryPerTask\": \"3g\"}}");
    assertEquals(3L << 30, text.blocks().memoryPerTask().bytes());
    ConfigException bad = assertThrows(ConfigException.class, () -> reader.parse(
        "{\"input\": {\"container\": \"v.zarr\"}, \"blocks\": {\"memoryPerTask\": \"4 gigs\"}}"));
    assertTrue(bad.getMessage().startsWith("blocks.memoryPerTask: "), bad.getMessage());
    assertTrue(bad.getMessage().contains("\"4 gigs\""), bad.getMessage());
    ConfigException zero = assertThrows(ConfigException.class, () -> reader.parse(
        "{\"input\": {\"container\": \"v.zarr\"}, \"blocks\": {\"memoryPerTask\": 0}}"));
    assertTrue(zero.getMessage().contains("blocks.memoryPerTask"), zero.getMessage());
    assertThrows(ConfigException.class, () -> ByteSize.parse("99999999999999999999g"));
  }
}
