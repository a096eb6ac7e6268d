// The sweep heat map as a self-contained SVG 1.1 file: plain shapes and text,
// no scripts, fonts or external references, so any browser or image viewer
// shows it. Layout: cells of the first two axes, one panel per combination of
// further axes, one shared colour scale with its legend on the right.
#include <algorithm>
#include <cmath>
#include <cstdio>

#include "lode/eval.h"

namespace lode {
namespace {

constexpr double kCellW = 64, kCellH = 30, kLeft = 110, kTop = 70, kPanelGap = 70, kLegendW = 150;

std::string fmt(const char* f, double v) {
  char buf[64];
  std::snprintf(buf, sizeof buf, f, v);
  return buf;
}

std::string escape(std::string_view s) {
  std::string out;
  for (char c : s) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      default: out += c;
    }
  }
  return out;
}

struct Rgb {
  double r, g, b;
};
// Our ramp: deep blue (low) through teal to pale yellow (high); light enough
// at the top that dark text stays readable, dark at the bottom for white text.
constexpr Rgb kRamp[] = {{38, 52, 110}, {52, 140, 140}, {150, 205, 110}, {248, 236, 160}};

Rgb colour_at(double t) {
  t = std::clamp(t, 0.0, 1.0) * (std::size(kRamp) - 1);
  auto i = std::min(static_cast<std::size_t>(t), std::size(kRamp) - 2);
  double f = t - static_cast<double>(i);
  const Rgb &a = kRamp[i], &b = kRamp[i + 1];
  return {a.r + (b.r - a.r) * f, a.g + (b.g - a.g) * f, a.b + (b.b - a.b) * f};
}

std::string hex(const Rgb& c) {
  char buf[8];
  std::snprintf(buf, sizeof buf, "#%02x%02x%02x", static_cast<unsigned>(std::lround(c.r)),
                static_cast<unsigned>(std::lround(c.g)), static_cast<unsigned>(std::lround(c.b)));
  return buf;
}

bool dark(const Rgb& c) { return 0.299 * c.r + 0.587 * c.g + 0.114 * c.b < 140; }

std::string text(double x, double y, std::string_view s, const char* extra = "") {
  return "<text x=\"" + fmt("%.1f", x) + "\" y=\"" + fmt("%.1f", y) + "\"" + extra + ">" + escape(s) + "</text>\n";
}

std::string setting_text(const SweepResult& r, const SweepCell& c) {
  std::string s;
  for (std::size_t i = 0; i < r.axes.size(); ++i)
    s += (i ? ", " : "") + std::string(sweep_param_name(r.axes[i].param)) + " " + fmt("%g", c.setting[i]);
  return s;
}

}  // namespace

std::string sweep_svg(const SweepResult& r, std::string_view title) {
  const std::size_t nx = r.axes[0].values.size();
  const std::size_t ny = r.axes.size() > 1 ? r.axes[1].values.size() : 1;
  const std::size_t per_panel = nx * ny;
  const std::size_t panels = r.cells.size() / per_panel;
  double lo = r.cells[0].value, hi = lo;
  for (auto& c : r.cells) lo = std::min(lo, c.value), hi = std::max(hi, c.value);
  auto scale = [&](double v) { return hi > lo ? (v - lo) / (hi - lo) : 0.5; };

  const double grid_w = kCellW * static_cast<double>(nx), grid_h = kCellH * static_cast<double>(ny);
  const double panel_h = grid_h + kPanelGap + 20;
  const double width = kLeft + grid_w + 40 + kLegendW;
  const double height = kTop + panel_h * static_cast<double>(panels) + 30;
  const std::string metric = metric_name(r.metric, r.eval);
  std::string s = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  s += "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"" + fmt("%.0f", width) + "\" height=\"" +
       fmt("%.0f", height) + "\" viewBox=\"0 0 " + fmt("%.0f", width) + " " + fmt("%.0f", height) +
       "\" font-family=\"sans-serif\" font-size=\"12\">\n";
  s += "<title>" + escape(title) + "</title>\n";
  s += "<rect width=\"100%\" height=\"100%\" fill=\"#ffffff\"/>\n";
  s += text(10, 22, title, " font-size=\"15\" font-weight=\"bold\"");
  s += text(10, 42, "mean " + metric + " over judged queries; best (outlined): " + setting_text(r, r.cells[r.best]) +
                        " = " + fmt("%.4f", r.cells[r.best].value));

  for (std::size_t p = 0; p < panels; ++p) {
    const double top = kTop + panel_h * static_cast<double>(p);
    const SweepCell& first = r.cells[p];
    if (r.axes.size() > 2) {
      std::string caption;
      for (std::size_t i = 2; i < r.axes.size(); ++i)
        caption += (i > 2 ? ", " : "") + std::string(sweep_param_name(r.axes[i].param)) + " = " +
                   fmt("%g", first.setting[i]);
      s += text(kLeft, top + 4, caption, " font-weight=\"bold\"");
    }
    const double gy = top + 14;
    for (std::size_t j = 0; j < ny; ++j)
      for (std::size_t i = 0; i < nx; ++i) {
        // Cells are stored with the last axis fastest, so the panel axes vary fastest of all.
        std::size_t idx = (i * ny + j) * panels + p;
        const SweepCell& c = r.cells[idx];
        Rgb col = colour_at(scale(c.value));
        double x = kLeft + kCellW * static_cast<double>(i), y = gy + kCellH * static_cast<double>(j);
        s += "<rect x=\"" + fmt("%.1f", x) + "\" y=\"" + fmt("%.1f", y) + "\" width=\"" + fmt("%.0f", kCellW) +
             "\" height=\"" + fmt("%.0f", kCellH) + "\" fill=\"" + hex(col) + "\" stroke=\"#ffffff\"/>\n";
        s += text(x + kCellW / 2, y + kCellH / 2 + 4, fmt("%.4f", c.value),
                  dark(col) ? " text-anchor=\"middle\" fill=\"#ffffff\"" : " text-anchor=\"middle\" fill=\"#111111\"");
        if (idx == r.best)
          s += "<rect x=\"" + fmt("%.1f", x + 1.5) + "\" y=\"" + fmt("%.1f", y + 1.5) + "\" width=\"" +
               fmt("%.0f", kCellW - 3) + "\" height=\"" + fmt("%.0f", kCellH - 3) +
               "\" fill=\"none\" stroke=\"#d01c1c\" stroke-width=\"3\"/>\n";
      }
    for (std::size_t i = 0; i < nx; ++i)
      s += text(kLeft + kCellW * (static_cast<double>(i) + 0.5), gy + grid_h + 16, fmt("%g", r.axes[0].values[i]),
                " text-anchor=\"middle\"");
    s += text(kLeft + grid_w / 2, gy + grid_h + 36, std::string(sweep_param_name(r.axes[0].param)),
              " text-anchor=\"middle\" font-weight=\"bold\"");
    if (r.axes.size() > 1) {
      for (std::size_t j = 0; j < ny; ++j)
        s += text(kLeft - 8, gy + kCellH * (static_cast<double>(j) + 0.5) + 4, fmt("%g", r.axes[1].values[j]),
                  " text-anchor=\"end\"");
      double cy = gy + grid_h / 2;
      s += text(30, cy, std::string(sweep_param_name(r.axes[1].param)),
                (" text-anchor=\"middle\" font-weight=\"bold\" transform=\"rotate(-90 30 " + fmt("%.1f", cy) + ")\"")
                    .c_str());
    }
  }

  // Legend: the ramp as stacked bands (no gradient element needed), top = highest value.
  const double lx = kLeft + grid_w + 40, ly = kTop + 14, lh = 160, bands = 32;
  s += text(lx, ly - 8, metric, " font-weight=\"bold\"");
  for (int k = 0; k < bands; ++k) {
    double t = 1 - (k + 0.5) / bands;
    s += "<rect x=\"" + fmt("%.1f", lx) + "\" y=\"" + fmt("%.2f", ly + lh * k / bands) + "\" width=\"20\" height=\"" +
         fmt("%.2f", lh / bands + 0.5) + "\" fill=\"" + hex(colour_at(t)) + "\"/>\n";
  }
  s += "<rect x=\"" + fmt("%.1f", lx) + "\" y=\"" + fmt("%.1f", ly) + "\" width=\"20\" height=\"" + fmt("%.0f", lh) +
       "\" fill=\"none\" stroke=\"#444444\"/>\n";
  for (int k = 0; k <= 4; ++k) {
    double v = hi - (hi - lo) * k / 4.0, y = ly + lh * k / 4.0;
    s += "<line x1=\"" + fmt("%.1f", lx + 20) + "\" y1=\"" + fmt("%.1f", y) + "\" x2=\"" + fmt("%.1f", lx + 25) +
         "\" y2=\"" + fmt("%.1f", y) + "\" stroke=\"#444444\"/>\n";
    s += text(lx + 28, y + 4, fmt("%.4f", v));
  }
  s += "</svg>\n";
  return s;
}

}  // namespace lode
