#include "acidload/io/svg.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>

namespace acidload::io::svg {

double LinearScale::operator()(double v) const {
  const double span = data.high - data.low;
  return pixels.low + (v - data.low) / span * (pixels.high - pixels.low);
}

double LinearScale::invert(double p) const {
  return data.low + (p - pixels.low) / (pixels.high - pixels.low) * (data.high - data.low);
}

namespace {

// A step of 1, 2 or 5 × 10ⁿ near span/target (Heckbert's nice numbers, rounding variant).
double nice_step(double span, int target) {
  const double raw = span / std::max(1, target);
  const double magnitude = std::pow(10.0, std::floor(std::log10(raw)));
  const double f = raw / magnitude;
  const double nice = f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10;
  return nice * magnitude;
}

Range widened(double low, double high) {
  if (!std::isfinite(low) || !std::isfinite(high)) return {0, 1};
  if (low > high) std::swap(low, high);
  if (high - low <= 1e-12 * std::max(1.0, std::fabs(high))) {  // one value: a range around it
    if (low == 0) return {0, 1};  // all zero: zero at the bottom
    const double pad = std::fabs(low) * 0.1;
    return {low - pad, high + pad};
  }
  return {low, high};
}

std::string f2(double v) {
  char b[32];
  std::snprintf(b, sizeof b, "%.2f", std::fabs(v) < 0.005 ? 0.0 : v);
  return b;
}

const Look looks[look_count] = {
    {"#1f1f1f", "", "circle"},         // ink black, solid
    {"#a4431b", "7 3", "square"},      // rust, dashed
    {"#245d86", "2 2.5", "triangle"},  // slate blue, dotted
    {"#587a1e", "10 3 2 3", "diamond"},  // olive, dash-dot
    {"#7a3f86", "4 2 1 2 1 2", "cross"},  // plum, dash-dot-dot
    {"#8a6d1a", "12 4", "bar"},        // ochre, long dash
};
constexpr const char* limit_ink = "#6b6b6b";
constexpr const char* limit_dash = "9 3 2 3";
constexpr const char* font = "font-family=\"DejaVu Sans, Liberation Sans, Arial, sans-serif\"";

// A marker of the look's shape at (x, y); `filled` false draws it hollow.
std::string marker(const Look& l, double x, double y, bool filled = true, double r = 3.5) {
  const std::string fill = filled ? l.ink : "#ffffff";
  const std::string common = " fill=\"" + fill + "\" stroke=\"" + l.ink + "\" stroke-width=\"1.3\"";
  const std::string m = l.marker;
  if (m == "circle") return "<circle cx=\"" + f2(x) + "\" cy=\"" + f2(y) + "\" r=\"" + f2(r) + "\"" + common + "/>";
  if (m == "square")
    return "<rect x=\"" + f2(x - r) + "\" y=\"" + f2(y - r) + "\" width=\"" + f2(2 * r) + "\" height=\"" + f2(2 * r) + "\"" +
           common + "/>";
  if (m == "triangle")
    return "<polygon points=\"" + f2(x) + "," + f2(y - 1.2 * r) + " " + f2(x + 1.1 * r) + "," + f2(y + 0.8 * r) + " " +
           f2(x - 1.1 * r) + "," + f2(y + 0.8 * r) + "\"" + common + "/>";
  if (m == "diamond")
    return "<polygon points=\"" + f2(x) + "," + f2(y - 1.3 * r) + " " + f2(x + 1.1 * r) + "," + f2(y) + " " + f2(x) + "," +
           f2(y + 1.3 * r) + " " + f2(x - 1.1 * r) + "," + f2(y) + "\"" + common + "/>";
  if (m == "cross")
    return "<path d=\"M" + f2(x - r) + " " + f2(y - r) + "L" + f2(x + r) + " " + f2(y + r) + "M" + f2(x - r) + " " + f2(y + r) +
           "L" + f2(x + r) + " " + f2(y - r) + "\" fill=\"none\" stroke=\"" + l.ink + "\" stroke-width=\"1.8\"/>";
  return "<rect x=\"" + f2(x - 1.2 * r) + "\" y=\"" + f2(y - 0.6 * r) + "\" width=\"" + f2(2.4 * r) + "\" height=\"" +
         f2(1.2 * r) + "\"" + common + "/>";
}

std::size_t code_points(std::string_view s) {
  std::size_t n = 0;
  for (char ch : s) n += (static_cast<unsigned char>(ch) & 0xC0) != 0x80;
  return n;
}

// The first n code points of UTF-8 text (never cutting one in two).
std::string first_code_points(std::string_view s, std::size_t n) {
  std::size_t i = 0, seen = 0;
  for (; i < s.size(); ++i)
    if ((static_cast<unsigned char>(s[i]) & 0xC0) != 0x80 && seen++ == n) break;
  return std::string(s.substr(0, i));
}

std::string dash_attr(const char* dash) {
  return *dash ? std::string(" stroke-dasharray=\"") + dash + "\"" : std::string();
}

void extend(double& lo, double& hi, double v) {
  if (!std::isfinite(v)) return;
  lo = std::min(lo, v);
  hi = std::max(hi, v);
}

std::string text(double x, double y, const std::string& s, const char* anchor = "start", double size = 11,
                 const std::string& extra = "") {
  return "<text x=\"" + f2(x) + "\" y=\"" + f2(y) + "\" " + font + " font-size=\"" + f2(size) + "\" text-anchor=\"" +
         anchor + "\" fill=\"#1f1f1f\"" + extra + ">" + escape(s) + "</text>";
}

std::string open_svg(const std::string& id, double w, double h, const std::string& title, const std::string& desc) {
  const std::string tid = id + "-title", did = id + "-desc";
  return "<svg xmlns=\"http://www.w3.org/2000/svg\" id=\"" + escape(id) + "\" class=\"chart\" role=\"img\" viewBox=\"0 0 " +
         f2(w) + " " + f2(h) + "\" width=\"" + f2(w) + "\" height=\"" + f2(h) + "\" aria-labelledby=\"" + escape(tid) + " " +
         escape(did) + "\"><title id=\"" + escape(tid) + "\">" + escape(title) + "</title><desc id=\"" + escape(did) +
         "\">" + escape(desc) + "</desc><rect x=\"0\" y=\"0\" width=\"" + f2(w) + "\" height=\"" + f2(h) +
         "\" fill=\"#ffffff\"/>";
}

// Axes, grid, ticks and labels of a frame.
std::string axes(const Frame& fr, const LinearScale& sx, const LinearScale& sy, const std::vector<double>& xt,
                 const std::vector<double>& yt, const std::string& xl, const std::string& yl, bool x_ticks_are_numbers = true) {
  std::string o = "<g class=\"axes\">";
  const double xstep = xt.size() > 1 ? xt[1] - xt[0] : 1, ystep = yt.size() > 1 ? yt[1] - yt[0] : 1;
  for (double v : yt) {
    const double y = sy(v);
    o += "<line x1=\"" + f2(fr.left) + "\" y1=\"" + f2(y) + "\" x2=\"" + f2(fr.right) + "\" y2=\"" + f2(y) +
         "\" stroke=\"#e2e2e2\" stroke-width=\"1\"/>";
    o += "<line x1=\"" + f2(fr.left - 4) + "\" y1=\"" + f2(y) + "\" x2=\"" + f2(fr.left) + "\" y2=\"" + f2(y) +
         "\" stroke=\"#1f1f1f\"/>";
    o += text(fr.left - 7, y + 3.8, tick_label(v, ystep), "end", 10.5, " class=\"tick\"");
  }
  if (x_ticks_are_numbers)
    for (double v : xt) {
      const double x = sx(v);
      o += "<line x1=\"" + f2(x) + "\" y1=\"" + f2(fr.top) + "\" x2=\"" + f2(x) + "\" y2=\"" + f2(fr.bottom) +
           "\" stroke=\"#efefef\" stroke-width=\"1\"/>";
      o += "<line x1=\"" + f2(x) + "\" y1=\"" + f2(fr.bottom) + "\" x2=\"" + f2(x) + "\" y2=\"" + f2(fr.bottom + 4) +
           "\" stroke=\"#1f1f1f\"/>";
      o += text(x, fr.bottom + 16, tick_label(v, xstep), "middle", 10.5, " class=\"tick\"");
    }
  o += "<rect x=\"" + f2(fr.left) + "\" y=\"" + f2(fr.top) + "\" width=\"" + f2(fr.right - fr.left) + "\" height=\"" +
       f2(fr.bottom - fr.top) + "\" fill=\"none\" stroke=\"#1f1f1f\" stroke-width=\"1\"/>";
  o += text((fr.left + fr.right) / 2, fr.bottom + 34, xl, "middle", 11.5, " class=\"axis-label x-label\"");
  const double cy = (fr.top + fr.bottom) / 2;
  o += "<text x=\"0\" y=\"0\" " + std::string(font) + " font-size=\"11.50\" text-anchor=\"middle\" fill=\"#1f1f1f\"" +
       " class=\"axis-label y-label\" transform=\"translate(" + f2(16) + "," + f2(cy) + ") rotate(-90)\">" + escape(yl) +
       "</text>";
  return o + "</g>";
}

struct LegendEntry {
  std::string label;
  int look;         // -1: limit style
  bool line, mark, band;
};

std::string legend(const Frame& fr, const std::vector<LegendEntry>& entries) {
  std::string o = "<g class=\"legend\">";
  double y = fr.top + 8;
  const double x = fr.right + 14;
  for (const LegendEntry& e : entries) {
    // up to two lines of about 24 characters, broken at a space
    std::string label = e.label, second;
    if (label.size() > 24) {
      std::size_t cut = label.rfind(' ', 24);
      if (cut == std::string::npos || cut < 8) cut = 24;
      second = label.substr(cut + (label[cut] == ' ' ? 1 : 0));
      label = label.substr(0, cut);
      if (second.size() > 24) second = second.substr(0, 22) + "…";
    }
    if (e.band) {
      const Look l = look(e.look);
      o += "<rect x=\"" + f2(x) + "\" y=\"" + f2(y - 5) + "\" width=\"22\" height=\"10\" fill=\"" + l.ink +
           "\" fill-opacity=\"0.18\" stroke=\"" + l.ink + "\" stroke-opacity=\"0.5\" stroke-width=\"0.8\"/>";
    } else if (e.line) {
      const char* ink = e.look < 0 ? limit_ink : look(e.look).ink;
      const char* dash = e.look < 0 ? limit_dash : look(e.look).dash;
      o += "<line x1=\"" + f2(x) + "\" y1=\"" + f2(y) + "\" x2=\"" + f2(x + 22) + "\" y2=\"" + f2(y) + "\" stroke=\"" + ink +
           "\" stroke-width=\"1.8\"" + dash_attr(dash) + "/>";
    }
    if (e.mark) o += marker(look(e.look), x + 11, y);
    o += text(x + 28, y + 3.8, label, "start", 10.5);
    if (!second.empty()) o += text(x + 28, y + 16.3, second, "start", 10.5), y += 12.5;
    y += 16;
    if (y > fr.bottom + 30) break;
  }
  return o + "</g>";
}

}  // namespace

std::vector<double> nice_ticks(double low, double high, int target) {
  const Range r = widened(low, high);
  const double step = nice_step(r.high - r.low, target);
  const double first = std::floor(r.low / step + 1e-9), last = std::ceil(r.high / step - 1e-9);  // in steps
  std::vector<double> t;
  for (double k = first; k <= last + 1e-9 && t.size() <= 1000; k += 1) t.push_back(k == 0 ? 0.0 : k * step);
  return t;
}

Range nice_range(double low, double high, int target) {
  const std::vector<double> t = nice_ticks(low, high, target);
  return {t.front(), t.back()};
}

std::string tick_label(double v, double step) {
  char b[32];
  const double a = std::fabs(v);
  if (a != 0 && (a >= 1e6 || a < 1e-3)) {
    std::snprintf(b, sizeof b, "%.3g", v);
    return b;
  }
  const int decimals = step >= 1 ? 0 : std::min(6, static_cast<int>(std::ceil(-std::log10(step) - 1e-9)));
  std::snprintf(b, sizeof b, "%.*f", decimals, std::fabs(v) < step * 1e-9 ? 0.0 : v);
  return b;
}

std::string escape(std::string_view s) {
  std::string o;
  o.reserve(s.size());
  for (char ch : s) switch (ch) {
      case '&': o += "&amp;"; break;
      case '<': o += "&lt;"; break;
      case '>': o += "&gt;"; break;
      case '"': o += "&quot;"; break;
      case '\'': o += "&#39;"; break;
      default:
        if (static_cast<unsigned char>(ch) < 0x20 && ch != '\n' && ch != '\t') o += ' ';  // not allowed in XML 1.0
        else o += ch;
    }
  return o;
}

Look look(int index) { return looks[((index % look_count) + look_count) % look_count]; }

Frame frame(double width, double height) { return {62, width - 200, 14, height - 46}; }

Scales scales(const LineChart& c) {
  const Frame fr = frame(c.width, c.height);
  double xlo = std::numeric_limits<double>::infinity(), xhi = -xlo, ylo = xlo, yhi = -xlo;
  for (const Series& s : c.series) {
    for (double v : s.x) extend(xlo, xhi, v);
    for (double v : s.y) extend(ylo, yhi, v);
  }
  for (const Points& p : c.points) {
    for (double v : p.x) extend(xlo, xhi, v);
    for (double v : p.y) extend(ylo, yhi, v);
    for (double v : p.low) extend(ylo, yhi, v);
    for (double v : p.high) extend(ylo, yhi, v);
  }
  for (const Band& b : c.bands) {
    for (double v : b.x) extend(xlo, xhi, v);
    for (double v : b.low) extend(ylo, yhi, v);
    for (double v : b.high) extend(ylo, yhi, v);
  }
  for (const ReferenceLine& l : c.lines)
    extend(l.direction == ReferenceLine::Direction::horizontal ? ylo : xlo,
           l.direction == ReferenceLine::Direction::horizontal ? yhi : xhi, l.at);
  if (c.y_from_zero) extend(ylo, yhi, 0);
  if (!(xlo <= xhi)) xlo = 0, xhi = 1;
  if (!(ylo <= yhi)) ylo = 0, yhi = 1;
  const Range xr = c.x_range ? *c.x_range : nice_range(xlo, xhi, 6);
  // headroom of 3 % so that markers on the highest value are not cut by the frame
  const Range yr = c.y_range ? *c.y_range : nice_range(ylo, yhi + 0.03 * (yhi - ylo), 5);
  return {LinearScale{widened(xr.low, xr.high), {fr.left, fr.right}},
          LinearScale{widened(yr.low, yr.high), {fr.bottom, fr.top}}};
}

Box text_box(double x, double baseline, std::string_view s, std::string_view anchor, double size) {
  const double w = 0.62 * size * static_cast<double>(code_points(s));
  const double left = anchor == "end" ? x - w : anchor == "middle" ? x - w / 2 : x;
  return {left, baseline - 0.78 * size, left + w, baseline + 0.24 * size};
}

bool overlap(const Box& a, const Box& b) {
  return a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;
}

std::vector<PlacedLabel> place_line_labels(const LineChart& c) {
  const Frame fr = frame(c.width, c.height);
  const Scales sc = scales(c);
  std::vector<PlacedLabel> placed;
  const auto free = [&](const Box& b) {
    if (b.left < fr.left || b.right > fr.right || b.top < fr.top || b.bottom > fr.bottom) return false;
    for (const PlacedLabel& p : placed)
      if (overlap(p.box, b)) return false;
    return true;
  };
  const auto try_at = [&](std::size_t i, double x, double y, const char* anchor, double size) {
    const Box b = text_box(x, y, c.lines[i].label, anchor, size);
    if (!free(b)) return false;
    placed.push_back({i, x, y, anchor, size, b});
    return true;
  };
  using D = ReferenceLine::Direction;
  for (std::size_t i = 0; i < c.lines.size(); ++i) {
    const ReferenceLine& l = c.lines[i];
    if (l.direction != D::horizontal || l.label.empty()) continue;
    const double y = sc.y(l.at);
    try_at(i, fr.right - 4, y - 4, "end", 10) || try_at(i, fr.right - 4, y + 12, "end", 10) ||
        try_at(i, fr.left + 4, y - 4, "start", 10) || try_at(i, fr.left + 4, y + 12, "start", 10);
  }
  std::vector<std::size_t> vertical;
  for (std::size_t i = 0; i < c.lines.size(); ++i)
    if (c.lines[i].direction == D::vertical && !c.lines[i].label.empty()) vertical.push_back(i);
  std::stable_sort(vertical.begin(), vertical.end(), [&](std::size_t a, std::size_t b) { return c.lines[a].at < c.lines[b].at; });
  for (std::size_t i : vertical) {
    const double x = sc.x(c.lines[i].at);
    const bool left_first = fr.right - x < 40;
    for (double y = fr.top + 11; y <= fr.bottom - 3; y += 12)
      if (left_first ? try_at(i, x - 3, y, "end", 9.5) || try_at(i, x + 3, y, "start", 9.5)
                     : try_at(i, x + 3, y, "start", 9.5) || try_at(i, x - 3, y, "end", 9.5))
        break;
  }
  return placed;
}

std::string line_chart(const LineChart& c) {
  const Frame fr = frame(c.width, c.height);
  const Scales sc = scales(c);
  const LinearScale &sx = sc.x, &sy = sc.y;
  std::string o = open_svg(c.id, c.width, c.height, c.title, c.description);
  o += axes(fr, sx, sy, nice_ticks(sx.data.low, sx.data.high, 6), nice_ticks(sy.data.low, sy.data.high, 5), c.x_label,
            c.y_label);
  const std::string clip = c.id + "-plot";
  o += "<clipPath id=\"" + escape(clip) + "\"><rect x=\"" + f2(fr.left) + "\" y=\"" + f2(fr.top) + "\" width=\"" +
       f2(fr.right - fr.left) + "\" height=\"" + f2(fr.bottom - fr.top) + "\"/></clipPath>";
  o += "<g clip-path=\"url(#" + escape(clip) + ")\">";
  std::vector<LegendEntry> legend_entries;
  for (const Band& b : c.bands) {
    const std::size_t n = std::min({b.x.size(), b.low.size(), b.high.size()});
    std::string pts;
    for (std::size_t i = 0; i < n; ++i)
      if (std::isfinite(b.x[i]) && std::isfinite(b.high[i])) pts += f2(sx(b.x[i])) + "," + f2(sy(b.high[i])) + " ";
    for (std::size_t i = n; i-- > 0;)
      if (std::isfinite(b.x[i]) && std::isfinite(b.low[i])) pts += f2(sx(b.x[i])) + "," + f2(sy(b.low[i])) + " ";
    if (!pts.empty()) pts.pop_back();
    const Look l = look(b.look);
    o += "<polygon class=\"band\" points=\"" + pts + "\" fill=\"" + l.ink + "\" fill-opacity=\"0.16\" stroke=\"" + l.ink +
         "\" stroke-opacity=\"0.45\" stroke-width=\"0.8\"/>";
    if (!b.label.empty()) legend_entries.push_back({b.label, b.look, false, false, true});
  }
  for (const ReferenceLine& l : c.lines) {
    const char* ink = l.look < 0 ? limit_ink : look(l.look).ink;
    const char* dash = l.look < 0 ? limit_dash : look(l.look).dash;
    if (l.direction == ReferenceLine::Direction::horizontal) {
      const double y = sy(l.at);
      o += "<line class=\"limit\" x1=\"" + f2(fr.left) + "\" y1=\"" + f2(y) + "\" x2=\"" + f2(fr.right) + "\" y2=\"" + f2(y) +
           "\" stroke=\"" + ink + "\" stroke-width=\"1.6\"" + dash_attr(dash) + "/>";
    } else {
      const double x = sx(l.at);
      o += "<line class=\"interval\" x1=\"" + f2(x) + "\" y1=\"" + f2(fr.top) + "\" x2=\"" + f2(x) + "\" y2=\"" +
           f2(fr.bottom) + "\" stroke=\"" + ink + "\" stroke-width=\"1.3\"" + dash_attr(dash) + "/>";
    }
  }
  for (const Series& s : c.series) {
    const Look l = look(s.look);
    const std::size_t n = std::min(s.x.size(), s.y.size());
    std::string d;
    bool pen = false;
    for (std::size_t i = 0; i < n; ++i) {
      if (!std::isfinite(s.x[i]) || !std::isfinite(s.y[i])) {
        pen = false;
        continue;
      }
      d += (pen ? "L" : "M") + f2(sx(s.x[i])) + " " + f2(sy(s.y[i]));
      pen = true;
    }
    o += "<path class=\"series\" d=\"" + d + "\" fill=\"none\" stroke=\"" + l.ink + "\" stroke-width=\"2\"" +
         dash_attr(l.dash) + " stroke-linejoin=\"round\"/>";
    if (s.markers && n > 0) {
      const std::size_t every = std::max<std::size_t>(1, n / 7);
      const std::size_t offset = (static_cast<std::size_t>(s.look) * every / look_count) % every;  // not all at one x
      for (std::size_t i = offset; i < n; i += every)
        if (std::isfinite(s.x[i]) && std::isfinite(s.y[i])) o += marker(l, sx(s.x[i]), sy(s.y[i]));
    }
    if (!s.label.empty()) legend_entries.push_back({s.label, s.look, true, s.markers, false});
  }
  o += "</g>";  // points are not clipped: a marker on the frame's edge shows whole
  for (const Points& p : c.points) {
    const Look l = look(p.look);
    const std::size_t n = std::min(p.x.size(), p.y.size());
    o += "<g class=\"points\">";
    for (std::size_t i = 0; i < n; ++i) {
      if (!std::isfinite(p.x[i]) || !std::isfinite(p.y[i])) continue;
      const double x = sx(p.x[i]);
      if (i < p.low.size() && i < p.high.size() && std::isfinite(p.low[i]) && std::isfinite(p.high[i])) {
        const double y0 = sy(p.low[i]), y1 = sy(p.high[i]);
        o += "<path class=\"error-bar\" d=\"M" + f2(x) + " " + f2(y0) + "L" + f2(x) + " " + f2(y1) + "M" + f2(x - 3) + " " +
             f2(y0) + "L" + f2(x + 3) + " " + f2(y0) + "M" + f2(x - 3) + " " + f2(y1) + "L" + f2(x + 3) + " " + f2(y1) +
             "\" stroke=\"" + l.ink + "\" stroke-width=\"1\" fill=\"none\"/>";
      }
      o += marker(l, x, sy(p.y[i]), !(i < p.hollow.size() && p.hollow[i]), p.radius);
    }
    o += "</g>";
    if (!p.label.empty()) legend_entries.push_back({p.label, p.look, false, true, false});
  }
  for (const PlacedLabel& p : place_line_labels(c))
    o += text(p.x, p.y, c.lines[p.line].label, p.anchor, p.size, " class=\"line-label\"");
  for (const ReferenceLine& l : c.lines)
    if (l.direction == ReferenceLine::Direction::horizontal && !l.label.empty() && l.look < 0) {
      legend_entries.push_back({"limit", -1, true, false, false});
      break;
    }
  o += legend(fr, legend_entries);
  return o + "</svg>";
}

std::string bar_chart(const BarChart& c) {
  const Frame fr = frame(c.width, c.height);
  double hi = 0, lo = 0;
  for (const auto& row : c.values)
    for (double v : row) extend(lo, hi, v);
  const LinearScale sy{nice_range(lo, hi, 5), {fr.bottom, fr.top}};
  const LinearScale sx{{0, static_cast<double>(std::max<std::size_t>(1, c.categories.size()))}, {fr.left, fr.right}};
  std::string o = open_svg(c.id, c.width, c.height, c.title, c.description);
  o += axes(fr, sx, sy, {}, nice_ticks(sy.data.low, sy.data.high, 5), c.x_label, c.y_label, false);
  const std::size_t groups = std::max<std::size_t>(1, c.groups.size());
  const double slot = (fr.right - fr.left) / std::max<std::size_t>(1, c.categories.size());
  const double bar = std::min(22.0, slot * 0.8 / static_cast<double>(groups));
  // hatch patterns so that groups differ without colour
  o += "<defs>";
  for (std::size_t g = 0; g < groups; ++g) {
    const Look l = look(static_cast<int>(g));
    const std::string id = c.id + "-hatch-" + std::to_string(g);
    o += "<pattern id=\"" + escape(id) + "\" width=\"6\" height=\"6\" patternUnits=\"userSpaceOnUse\"" +
         (g % 3 == 1 ? " patternTransform=\"rotate(45)\"" : g % 3 == 2 ? " patternTransform=\"rotate(-45)\"" : "") + ">" +
         "<rect width=\"6\" height=\"6\" fill=\"" + l.ink + "\" fill-opacity=\"" + (g % 2 ? "0.25" : "0.85") + "\"/>" +
         (g == 0 ? "" : "<line x1=\"0\" y1=\"0\" x2=\"0\" y2=\"6\" stroke=\"" + std::string(l.ink) + "\" stroke-width=\"2\"/>") +
         "</pattern>";
  }
  o += "</defs><g class=\"bars\">";
  for (std::size_t k = 0; k < c.categories.size(); ++k) {
    const double x0 = fr.left + slot * static_cast<double>(k) + (slot - bar * static_cast<double>(groups)) / 2;
    for (std::size_t g = 0; g < groups && k < c.values.size() && g < c.values[k].size(); ++g) {
      const double v = c.values[k][g];
      if (!std::isfinite(v)) continue;
      const double y0 = sy(0), y1 = sy(v);
      o += "<rect class=\"bar\" x=\"" + f2(x0 + bar * static_cast<double>(g)) + "\" y=\"" + f2(std::min(y0, y1)) +
           "\" width=\"" + f2(bar * 0.92) + "\" height=\"" + f2(std::fabs(y0 - y1)) + "\" fill=\"url(#" +
           escape(c.id + "-hatch-" + std::to_string(g)) + ")\" stroke=\"" + look(static_cast<int>(g)).ink +
           "\" stroke-width=\"1\"><title>" + escape(c.categories[k] + ", " + (g < c.groups.size() ? c.groups[g] : "") + ": ") +
           tick_label(v, 0.01) + "</title></rect>";
    }
    // shortened to fit its slot (text_box's width rule), so that neighbouring labels do not overlap
    const std::size_t fits = std::min<std::size_t>(18, static_cast<std::size_t>(std::max(3.0, slot * 0.95 / (0.62 * 10))));
    std::string label = c.categories[k];
    if (code_points(label) > fits) label = first_code_points(label, fits - 1) + "…";
    o += text(fr.left + slot * (static_cast<double>(k) + 0.5), fr.bottom + 15, label, "middle", 10, " class=\"tick\"");
  }
  o += "</g><g class=\"legend\">";
  double y = fr.top + 8;
  for (std::size_t g = 0; g < c.groups.size(); ++g) {
    o += "<rect x=\"" + f2(fr.right + 14) + "\" y=\"" + f2(y - 6) + "\" width=\"16\" height=\"12\" fill=\"url(#" +
         escape(c.id + "-hatch-" + std::to_string(g)) + ")\" stroke=\"" + look(static_cast<int>(g)).ink + "\"/>";
    o += text(fr.right + 36, y + 3.8, c.groups[g], "start", 10.5);
    y += 17;
  }
  return o + "</g></svg>";
}

}  // namespace acidload::io::svg
