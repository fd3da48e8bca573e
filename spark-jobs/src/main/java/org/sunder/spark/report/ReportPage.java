package org.sunder.spark.report;

import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.Base64;
import java.util.List;
import javax.imageio.ImageIO;

/**
 * A self-contained HTML page under construction: sections, tables, preformatted text and PNG
 * pictures embedded as data URIs, so the single file can be mailed or opened anywhere. When
 * loaded, a script marks {@code <body data-images="loaded">} when every picture decoded, else
 * {@code "broken"}, and then shows a warning line.
 */
final class ReportPage {
  private final StringBuilder html = new StringBuilder();
  private int images;

  ReportPage(String title) {
    html.append("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">\n<title>")
        .append(escape(title)).append("</title>\n<style>\n")
        .append("body{font-family:sans-serif;margin:24px;max-width:1400px;color:#222}\n")
        .append("h1{font-size:1.6em}h2{border-bottom:1px solid #ccc;margin-top:1.6em}\n")
        .append("table{border-collapse:collapse;margin:8px 0}td,th{border:1px solid #ccc;")
        .append("padding:3px 8px;text-align:right}th{background:#f2f2f2}")
        .append("td.l,th.l{text-align:left}\n")
        .append("pre{background:#f7f7f7;padding:8px;overflow-x:auto}\n")
        .append("figure{display:inline-block;margin:6px;vertical-align:top}")
        .append("figcaption{font-size:.85em;color:#444;max-width:420px}\n")
        .append(".caution{background:#fff4d6;border-left:4px solid #e0a800;padding:8px 12px}\n")
        .append("</style></head>\n<body>\n<h1>").append(escape(title)).append("</h1>\n");
  }

  ReportPage heading(String text) {
    html.append("<h2>").append(escape(text)).append("</h2>\n");
    return this;
  }

  ReportPage paragraph(String text) {
    html.append("<p>").append(escape(text)).append("</p>\n");
    return this;
  }

  ReportPage caution(String text) {
    html.append("<p class=\"caution\">").append(escape(text)).append("</p>\n");
    return this;
  }

  ReportPage preformatted(String text) {
    html.append("<pre>").append(escape(text)).append("</pre>\n");
    return this;
  }

  /** A table; the first column is left-aligned, the others right-aligned (numbers). */
  ReportPage table(List<String> header, List<List<String>> rows) {
    return table(header, rows, 1);
  }

  /** A table whose first {@code leftColumns} columns are left-aligned (text). */
  ReportPage table(List<String> header, List<List<String>> rows, int leftColumns) {
    html.append("<table><tr>");
    for (int i = 0; i < header.size(); i++) {
      html.append(i < leftColumns ? "<th class=\"l\">" : "<th>").append(escape(header.get(i)))
          .append("</th>");
    }
    html.append("</tr>\n");
    for (List<String> row : rows) {
      html.append("<tr>");
      for (int i = 0; i < row.size(); i++) {
        html.append(i < leftColumns ? "<td class=\"l\">" : "<td>").append(escape(row.get(i)))
            .append("</td>");
      }
      html.append("</tr>\n");
    }
    html.append("</table>\n");
    return this;
  }

  /** A picture with a caption, embedded as a PNG data URI. */
  ReportPage figure(BufferedImage image, String caption) {
    images++;
    html.append("<figure><img alt=\"").append(escape(caption)).append("\" width=\"")
        .append(image.getWidth()).append("\" height=\"").append(image.getHeight())
        .append("\" src=\"data:image/png;base64,").append(Base64.getEncoder().encodeToString(png(image)))
        .append("\"><figcaption>").append(escape(caption)).append("</figcaption></figure>\n");
    return this;
  }

  /** A line break after a row of figures. */
  ReportPage breakLine() {
    html.append("<div></div>\n");
    return this;
  }

  int imageCount() {
    return images;
  }

  /** The finished page. */
  String html() {
    return html + "<script>\nwindow.addEventListener('load', function () {\n"
        + "  var all = Array.prototype.slice.call(document.images);\n"
        + "  var ok = all.every(function (i) { return i.complete && i.naturalWidth > 0; });\n"
        + "  document.body.setAttribute('data-images', ok ? 'loaded' : 'broken');\n"
        + "  document.body.setAttribute('data-image-count', String(all.length));\n"
        + "  if (!ok) { var p = document.createElement('p'); p.className = 'caution';\n"
        + "    p.textContent = 'Some pictures of this report did not load.';\n"
        + "    document.body.insertBefore(p, document.body.firstChild); }\n"
        + "});\n</script>\n</body></html>\n";
  }

  static byte[] png(BufferedImage image) {
    ByteArrayOutputStream bytes = new ByteArrayOutputStream();
    try {
      if (!ImageIO.write(image, "png", bytes)) {
        throw new IllegalStateException("no PNG writer in this Java runtime");
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return bytes.toByteArray();
  }

  static String escape(String text) {
    StringBuilder out = new StringBuilder(text.length());
    for (int i = 0; i < text.length(); i++) {
      char c = text.charAt(i);
      switch (c) {
        case '<' -> out.append("&lt;");
        case '>' -> out.append("&gt;");
        case '&' -> out.append("&amp;");
        case '"' -> out.append("&quot;");
        default -> out.append(c);
      }
    }
    return out.toString();
  }
}
