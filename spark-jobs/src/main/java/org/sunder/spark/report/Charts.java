package org.sunder.spark.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.image.BufferedImage;
import java.text.DecimalFormat;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberTickUnit;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;

/** The report's charts, drawn by JFreeChart. */
final class Charts {
  private Charts() {}

  /** A base-10 log axis with a tick per decade, labelled as plain numbers. */
  private static LogAxis decades(String label, double smallest) {
    LogAxis axis = new LogAxis(label);
    axis.setBase(10);
    axis.setSmallestValue(smallest);
    axis.setTickUnit(new NumberTickUnit(1.0));
    axis.setNumberFormatOverride(new DecimalFormat("#,##0"));
    axis.setMinorTickMarksVisible(true);
    return axis;
  }

  /**
   * The segment size histogram on log–log axes: one point per power-of-two size bin that holds
   * segments, at the bin's geometric centre, with its segment count.
   *
   * @param counts {@link SegmentSizes#log2Histogram} of the sizes
   */
  static BufferedImage sizeHistogram(long[] counts, int width, int height) {
    XYSeries series = new XYSeries("segments per size bin");
    for (int b = 0; b < counts.length; b++) {
      if (counts[b] > 0) {
        series.add(Math.pow(2, b + 0.5), counts[b]);
      }
    }
    LogAxis size = decades("segment size (voxels, bins of factor 2)", 1);
    LogAxis count = decades("segments", 0.5);
    XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer(true, true);
    renderer.setSeriesPaint(0, new Color(0x1f, 0x5f, 0xa8));
    renderer.setSeriesStroke(0, new BasicStroke(1.5f));
    XYPlot plot = new XYPlot(new XYSeriesCollection(series), size, count, renderer);
    plot.setBackgroundPaint(Color.WHITE);
    plot.setDomainGridlinePaint(Color.LIGHT_GRAY);
    plot.setRangeGridlinePaint(Color.LIGHT_GRAY);
    JFreeChart chart = new JFreeChart("Segment sizes", JFreeChart.DEFAULT_TITLE_FONT, plot, false);
    chart.setBackgroundPaint(Color.WHITE);
    return chart.createBufferedImage(width, height);
  }
}
