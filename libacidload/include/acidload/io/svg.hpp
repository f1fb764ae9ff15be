#pragma once
// A small SVG writer of acidload's own for the report's plots: line charts (series, points with
// error bars, bands, horizontal and vertical reference lines, a legend) and grouped bar charts.
// Pure functions: a chart description in, SVG text out. Every chart carries <title> and <desc>
// (text alternatives) and tells its series apart by line style and marker shape, not colour alone,
// so that it reads in greyscale. Coordinates are written with 2 decimals.
#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace acidload::io::svg {

//! A closed interval of data or page units.
struct Range {
  double low = 0, high = 1;
};

//! A linear map from a data range onto a pixel range (the pixel range may run downwards, as y does).
struct LinearScale {
  Range data, pixels;
  double operator()(double value) const;  //!< pixel of a data value (extrapolates outside the range)
  double invert(double pixel) const;      //!< data value of a pixel
};

//! Tick values for an axis: multiples of 1, 2 or 5 × 10ⁿ covering [low, high] with about `target`
//! steps (the "nice numbers" rule, Heckbert, Graphics Gems, 1990). A degenerate range is widened.
std::vector<double> nice_ticks(double low, double high, int target = 5);
//! The axis range the ticks span: [first tick, last tick] of nice_ticks, which contains [low, high].
Range nice_range(double low, double high, int target = 5);
//! A tick label: the value with as few digits as the tick step needs ("0", "2.5", "4000", "1e+06").
std::string tick_label(double value, double step);

//! Text made safe for XML character data and attribute values (& < > " ').
std::string escape(std::string_view text);

//! How a series is drawn: the n-th of a fixed set of (ink, dash pattern, marker) triples, chosen so
//! that neighbours differ in all three.
struct Look {
  const char* ink;     //!< stroke colour
  const char* dash;    //!< stroke-dasharray ("" for solid)
  const char* marker;  //!< "circle", "square", "triangle", "diamond", "cross", "bar"
};
Look look(int index);
inline constexpr int look_count = 6;

struct Series {  //!< a line through points in order (NaN values break the line)
  std::string label;
  std::vector<double> x, y;
  int look = 0;
  bool markers = true;  //!< a marker every few points, so the series reads without colour
};
struct Points {  //!< separate points, e.g. lab readings, with optional error bars
  std::string label;
  std::vector<double> x, y;
  std::vector<double> low, high;  //!< error-bar ends (empty: none)
  int look = 0;
  std::vector<bool> hollow;       //!< a hollow marker (e.g. a censored reading); empty: all filled
  double radius = 3.8;            //!< marker size [px]
};
struct Band {  //!< a shaded region between two curves over x
  std::string label;
  std::vector<double> x, low, high;
  int look = 0;
};
struct ReferenceLine {  //!< a limit (horizontal) or an event such as a drain interval (vertical)
  enum class Direction { horizontal, vertical };
  Direction direction = Direction::horizontal;
  double at = 0;
  std::string label;
  int look = -1;  //!< -1: the plain grey of limits
};

struct LineChart {
  std::string id;          //!< an id for the <svg> element (letters, digits, '-')
  std::string title;       //!< the <title>: what the chart shows
  std::string description; //!< the <desc>: the key figures in words
  std::string x_label, y_label;  //!< with units, e.g. "oil hours [h]"
  std::vector<Series> series;
  std::vector<Points> points;
  std::vector<Band> bands;
  std::vector<ReferenceLine> lines;
  std::optional<Range> x_range, y_range;  //!< fixed ranges; otherwise from the data (and the lines)
  bool y_from_zero = true;  //!< include 0 in the automatic y range
  double width = 700, height = 320;
};

struct BarChart {
  std::string id, title, description, x_label, y_label;
  std::vector<std::string> categories;  //!< along x (e.g. variants)
  std::vector<std::string> groups;      //!< bars within a category (e.g. acids), each a look
  std::vector<std::vector<double>> values;  //!< values[category][group]
  double width = 700, height = 320;
};

//! The plot area of a chart of the given size, in pixels: left, right, top and bottom edges.
struct Frame {
  double left, right, top, bottom;
};
Frame frame(double width, double height);

//! The scales a line chart uses (x left to right, y bottom to top), as line_chart draws them.
struct Scales {
  LinearScale x, y;
};
Scales scales(const LineChart& c);

//! The box a line of text takes on the page [px], as the writer reckons it: the width from the
//! number of characters (0.62 em each, a little above DejaVu Sans' average digit of 0.636 em less
//! its side bearings), 0.78 em above the baseline and 0.24 em below. `anchor` is "start", "middle"
//! or "end", as SVG's text-anchor.
struct Box {
  double left, top, right, bottom;
};
Box text_box(double x, double baseline, std::string_view text, std::string_view anchor, double size);
//! Whether two boxes share any area (touching edges do not count).
bool overlap(const Box& a, const Box& b);

//! Where the labels of reference lines go (line_chart uses it; exposed for tests). Horizontal lines
//! first, each at the first free place of: above the line at the right, below it at the right, above
//! at the left, below at the left; then vertical lines in order of position, each at the first free
//! row from the top (12 px apart), right of its line or, failing that or near the right edge, left.
//! "Free": inside the frame and overlapping no label already placed. A label with no free place is
//! left out (its value stays in the chart's description).
struct PlacedLabel {
  std::size_t line;   //!< index into LineChart::lines
  double x, y;        //!< anchor point and baseline [px]
  const char* anchor;
  double size;        //!< font size [px]
  Box box;
};
std::vector<PlacedLabel> place_line_labels(const LineChart& c);

//! The chart as one <svg> element (no XML declaration: meant to be inlined in HTML or saved alone).
std::string line_chart(const LineChart& c);
std::string bar_chart(const BarChart& c);

}  // namespace acidload::io::svg
