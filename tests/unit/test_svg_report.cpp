// The SVG writer and the report: output parses as XML (checked by expat, an independent parser),
// scaled coordinates match the data, SHA-256 matches the FIPS 180-2 examples, writing is safe.
#include <doctest/doctest.h>
#include <expat.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include "acidload/core/error.hpp"
#include "acidload/io/case_file.hpp"
#include "acidload/io/report.hpp"
#include "acidload/io/svg.hpp"
#include "acidload/studies/fit_band.hpp"
#include "../support/scratch.hpp"

using namespace acidload;
using namespace acidload::io;

namespace {

struct XmlElement {
  std::string name;
  std::map<std::string, std::string> attributes;
  std::string text;
};

// Parses with expat; every element with its attributes, in document order. Fails the test on an XML error.
std::vector<XmlElement> parse_xml(const std::string& xml) {
  struct State {
    std::vector<XmlElement> all;
    std::vector<std::size_t> open;
  } st;
  XML_Parser p = XML_ParserCreate("UTF-8");
  XML_SetUserData(p, &st);
  XML_SetElementHandler(
      p,
      [](void* u, const XML_Char* name, const XML_Char** atts) {
        auto* s = static_cast<State*>(u);
        XmlElement e;
        e.name = name;
        for (int i = 0; atts[i]; i += 2) e.attributes[atts[i]] = atts[i + 1];
        s->open.push_back(s->all.size());
        s->all.push_back(e);
      },
      [](void* u, const XML_Char*) { static_cast<State*>(u)->open.pop_back(); });
  XML_SetCharacterDataHandler(p, [](void* u, const XML_Char* t, int len) {
    auto* s = static_cast<State*>(u);
    if (!s->open.empty()) s->all[s->open.back()].text.append(t, static_cast<std::size_t>(len));
  });
  const bool ok = XML_Parse(p, xml.data(), static_cast<int>(xml.size()), 1) != XML_STATUS_ERROR;
  if (!ok) {
    const std::string why = XML_ErrorString(XML_GetErrorCode(p));
    const long line = static_cast<long>(XML_GetCurrentLineNumber(p)), col = static_cast<long>(XML_GetCurrentColumnNumber(p));
    XML_ParserFree(p);
    FAIL("not well-formed XML: " << why << " at " << line << ":" << col);
  }
  XML_ParserFree(p);
  return st.all;
}

std::vector<const XmlElement*> with(const std::vector<XmlElement>& all, const std::string& name, const std::string& cls = "") {
  std::vector<const XmlElement*> out;
  for (const XmlElement& e : all)
    if (e.name == name && (cls.empty() || (e.attributes.count("class") && e.attributes.at("class") == cls))) out.push_back(&e);
  return out;
}

// The points of a path "M x y L x y …".
std::vector<std::pair<double, double>> path_points(const std::string& d) {
  std::vector<std::pair<double, double>> out;
  std::string t = d;
  for (char& ch : t)
    if (ch == 'M' || ch == 'L') ch = ' ';
  std::istringstream in(t);
  double x, y;
  while (in >> x >> y) out.emplace_back(x, y);
  return out;
}

svg::LineChart sample_chart() {
  svg::LineChart c;
  c.id = "t";
  c.title = "TBN & TAN <test>";
  c.description = "a chart \"quoted\" & escaped";
  c.x_label = "oil hours [h]";
  c.y_label = "TBN [mg KOH/g]";
  c.series.push_back({"base", {0, 500, 1000, 1500, 2000}, {6.0, 5.1, 4.3, 3.6, 3.0}, 0, true});
  c.series.push_back({"other", {0, 1000, 2000}, {6.0, 4.8, 3.9}, 1, true});
  c.points.push_back({"lab", {250, 1250}, {5.5, 4.0}, {5.3, 3.8}, {5.7, 4.2}, 1, {false, true}});
  c.bands.push_back({"band", {0, 1000, 2000}, {5.8, 4.1, 2.8}, {6.2, 4.5, 3.2}, 0});
  c.lines.push_back({svg::ReferenceLine::Direction::horizontal, 3.0, "TBN limit 3.00", -1});
  c.lines.push_back({svg::ReferenceLine::Direction::vertical, 1800, "1800 h", 0});
  return c;
}

}  // namespace

TEST_CASE("nice ticks are 1, 2 or 5 x 10^n steps covering the range (Heckbert's nice numbers)") {
  // expected values worked by hand from the rule
  CHECK(svg::nice_ticks(0, 8000, 6) == std::vector<double>{0, 1000, 2000, 3000, 4000, 5000, 6000, 7000, 8000});
  CHECK(svg::nice_ticks(0, 8000, 3) == std::vector<double>{0, 2000, 4000, 6000, 8000});
  CHECK(svg::nice_ticks(0, 6.2, 5) == std::vector<double>{0, 1, 2, 3, 4, 5, 6, 7});
  const auto small = svg::nice_ticks(0.13, 0.87, 5);  // step 0.74/5 = 0.148 rounds to 0.1
  REQUIRE(small.size() == 9);
  for (std::size_t i = 0; i < small.size(); ++i) CHECK(small[i] == doctest::Approx(0.1 * static_cast<double>(i + 1)));
  const svg::Range r = svg::nice_range(1234, 5678);
  CHECK(r.low <= 1234);
  CHECK(r.high >= 5678);
  const auto one = svg::nice_ticks(5, 5);  // a single value is widened, not divided by zero
  CHECK(one.size() >= 2);
  CHECK(one.front() < 5);
  CHECK(one.back() > 5);
  CHECK(svg::tick_label(2000, 1000) == "2000");
  CHECK(svg::tick_label(0.4, 0.2) == "0.4");
  CHECK(svg::tick_label(2.5, 0.5) == "2.5");
}

TEST_CASE("a linear scale maps the data range onto the pixel range and back") {
  const svg::LinearScale s{{0, 8000}, {62, 450}};
  CHECK(s(0) == doctest::Approx(62));
  CHECK(s(8000) == doctest::Approx(450));
  CHECK(s(4000) == doctest::Approx(256));
  CHECK(s.invert(s(1234.5)) == doctest::Approx(1234.5));
  const svg::LinearScale y{{0, 10}, {274, 14}};  // y runs downwards
  CHECK(y(10) == doctest::Approx(14));
  CHECK(y(2.5) == doctest::Approx(274 - 0.25 * 260));
}

TEST_CASE("a line chart is well-formed XML with a title, a description and axis labels") {
  const std::string out = svg::line_chart(sample_chart());
  const auto all = parse_xml(out);
  REQUIRE(!all.empty());
  CHECK(all.front().name == "svg");
  CHECK(all.front().attributes.at("role") == "img");
  const auto titles = with(all, "title"), descs = with(all, "desc");
  REQUIRE(titles.size() >= 1);
  CHECK(titles.front()->text == "TBN & TAN <test>");  // escaped in the file, read back as written
  REQUIRE(descs.size() == 1);
  CHECK(descs.front()->text == "a chart \"quoted\" & escaped");
  bool x_label = false, y_label = false;
  for (const XmlElement* t : with(all, "text")) {
    x_label |= t->text == "oil hours [h]";
    y_label |= t->text == "TBN [mg KOH/g]";
  }
  CHECK(x_label);
  CHECK(y_label);
}

TEST_CASE("series, points, bands and limit lines sit at the scaled data coordinates") {
  const svg::LineChart c = sample_chart();
  const svg::Scales sc = svg::scales(c);
  const auto all = parse_xml(svg::line_chart(c));
  // the axis range holds every value, and the frame's edges are where frame() says
  const svg::Frame fr = svg::frame(c.width, c.height);
  CHECK(sc.x(sc.x.data.low) == doctest::Approx(fr.left));
  CHECK(sc.y(sc.y.data.high) == doctest::Approx(fr.top));
  CHECK(sc.y.data.low == 0);  // y from zero
  CHECK(sc.x.data.high >= 2000);
  const auto paths = with(all, "path", "series");
  REQUIRE(paths.size() == 2);
  for (std::size_t k = 0; k < 2; ++k) {
    const auto pts = path_points(paths[k]->attributes.at("d"));
    REQUIRE(pts.size() == c.series[k].x.size());
    for (std::size_t i = 0; i < pts.size(); ++i) {
      // independent of the writer: the linear map written out here
      const double px = fr.left + (c.series[k].x[i] - sc.x.data.low) / (sc.x.data.high - sc.x.data.low) * (fr.right - fr.left);
      const double py = fr.bottom - (c.series[k].y[i] - sc.y.data.low) / (sc.y.data.high - sc.y.data.low) * (fr.bottom - fr.top);
      CHECK(pts[i].first == doctest::Approx(px).epsilon(0.0001));
      CHECK(pts[i].second == doctest::Approx(py).epsilon(0.0001));
    }
  }
  const auto limits = with(all, "line", "limit");
  REQUIRE(limits.size() == 1);
  CHECK(std::stod(limits[0]->attributes.at("y1")) == doctest::Approx(sc.y(3.0)).epsilon(0.0001));
  const auto intervals = with(all, "line", "interval");
  REQUIRE(intervals.size() == 1);
  CHECK(std::stod(intervals[0]->attributes.at("x1")) == doctest::Approx(sc.x(1800)).epsilon(0.0001));
  const auto bars = with(all, "path", "error-bar");
  REQUIRE(bars.size() == 2);
  const auto eb = path_points(bars[0]->attributes.at("d"));
  CHECK(eb[0].first == doctest::Approx(sc.x(250)).epsilon(0.0001));
  CHECK(eb[0].second == doctest::Approx(sc.y(5.3)).epsilon(0.0001));
  CHECK(eb[1].second == doctest::Approx(sc.y(5.7)).epsilon(0.0001));
  REQUIRE(with(all, "polygon", "band").size() == 1);
}

TEST_CASE("series are told apart without colour: each look differs from its neighbours in dash and marker") {
  for (int i = 0; i < svg::look_count; ++i) {
    const svg::Look a = svg::look(i), b = svg::look(i + 1);
    CHECK(std::string(a.dash) != b.dash);
    CHECK(std::string(a.marker) != b.marker);
  }
  CHECK(std::string(svg::look(0).marker) == svg::look(svg::look_count).marker);  // the set repeats
}

TEST_CASE("a bar chart is well-formed and its bars are as tall as their values") {
  svg::BarChart b;
  b.id = "acids";
  b.title = "acid";
  b.description = "d";
  b.x_label = "variant";
  b.y_label = "acid into the oil [g KOH/h]";
  b.categories = {"raw gas", "scrubbed"};
  b.groups = {"H2SO4", "HCl"};
  b.values = {{4.0, 1.0}, {0.8, 1.0}};
  const auto all = parse_xml(svg::bar_chart(b));
  const auto bars = with(all, "rect", "bar");
  REQUIRE(bars.size() == 4);
  const svg::Frame fr = svg::frame(b.width, b.height);
  const svg::Range r = svg::nice_range(0, 4.0);
  const double per_unit = (fr.bottom - fr.top) / (r.high - r.low);
  CHECK(std::stod(bars[0]->attributes.at("height")) == doctest::Approx(4.0 * per_unit).epsilon(0.0001));
  CHECK(std::stod(bars[2]->attributes.at("height")) == doctest::Approx(0.8 * per_unit).epsilon(0.001));
}

TEST_CASE("SHA-256 matches the FIPS 180-2 examples") {
  // FIPS 180-2, appendix B.1 and B.2; the empty string as printed by sha256sum
  CHECK(sha256_hex("abc") == "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  CHECK(sha256_hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq") ==
        "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
  CHECK(sha256_hex("") == "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
  CHECK(sha256_hex(std::string(1000000, 'a')) == "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
}

TEST_CASE("the report page of the demo case is well-formed, marks its inputs and lists its files") {
  const CaseFile c = load_case(ACIDLOAD_SOURCE_DIR "/cases/demo-site.yaml");
  std::vector<VariantSummary> rows;
  for (const EngineCase& v : c.variants) rows.push_back(summarize(v));
  ReportOptions o;
  o.sweep_points = 5;
  o.generated = "test";
  const ReportData d = gather_report(c, rows, o);
  // the inputs as understood: the file's keys are given, the rest defaults
  const auto find = [&](const std::string& key) {
    for (const InputRow& r : d.inputs)
      if (r.key == key) return r;
    FAIL("no input row " << key);
    return InputRow{};
  };
  CHECK(find("fuel.h2s").origin == Origin::given);
  CHECK(find("fuel.h2s").value == "300 ppmv");
  CHECK(find("model.liner-uptake").origin == Origin::default_value);
  REQUIRE(d.variant_inputs.size() == c.variants.size() - 1);
  bool h2s_changed = false;
  for (const InputRow& r : d.variant_inputs[0]) h2s_changed |= r.key == "fuel.h2s" && r.origin == Origin::variant;
  CHECK(h2s_changed);
  CHECK(d.invented);
  REQUIRE(!d.files.empty());
  CHECK(d.files[0].sha256.size() == 64);
  // the sweep reproduces each variant's own interval at its own H2S where the sweep passes through it
  REQUIRE(d.sweeps.size() == c.variants.size());
  CHECK(d.sweeps[0].h2s_ppmv.front() == 0);
  const std::string html = report_html(d);
  CHECK(html.rfind(report_signature, 0) == 0);  // the first line says whose it is
  CHECK(html.find(report_marker) < 200);
  CHECK(html.find("<script") == std::string::npos);
  CHECK(html.find("http://") == html.find("http://www.w3.org/2000/svg"));  // no address but the SVG namespace
  // the page is XHTML-clean enough for expat once the doctype is dropped
  const auto all = parse_xml(html.substr(html.find("<html")));
  CHECK(with(all, "svg").size() == 8);  // TBN, TAN, SAN, oxidation, viscosity, antioxidant, H2S sweep, acids
  for (const XmlElement* th : with(all, "th")) CHECK(th->attributes.count("scope") == 1);
}

TEST_CASE("the overlay of a fit marks its parameters as fitted") {
  namespace fs = std::filesystem;
  const fs::path dir = acidload::test::scratch_path("acidload-report-test");
  fs::create_directories(dir);
  const fs::path ov = dir / "fitted.yaml";
  std::ofstream(ov) << "# Fitted by acidload test\nformat-version: 1\nmodel:\n  liner-uptake: 2 %\n";
  const CaseFile c = load_case(ACIDLOAD_SOURCE_DIR "/cases/demo-site.yaml", {ov.string()});
  bool fitted = false;
  for (const InputRow& r : input_rows(c, 0)) fitted |= r.key == "model.liner-uptake" && r.origin == Origin::fitted;
  CHECK(fitted);
  fs::remove_all(dir);
}

TEST_CASE("a report replaces only a file that is an acidload report, and atomically") {
  namespace fs = std::filesystem;
  const fs::path dir = acidload::test::scratch_path("acidload-report-write");
  fs::remove_all(dir);
  fs::create_directories(dir);
  const fs::path other = dir / "notes.html";
  std::ofstream(other) << "<html>my own notes</html>";
  CHECK_THROWS_AS(write_report(other.string(), std::string(report_signature) + " -->\nnew"), Error);
  std::ifstream in(other);
  std::string kept((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  CHECK(kept == "<html>my own notes</html>");
  const fs::path mine = dir / "report.html";
  write_report(mine.string(), std::string(report_signature) + " -->\none");
  write_report(mine.string(), std::string(report_signature) + " -->\ntwo");  // its own report: replaced
  std::ifstream in2(mine);
  std::string now((std::istreambuf_iterator<char>(in2)), std::istreambuf_iterator<char>());
  CHECK(now.find("two") != std::string::npos);
  std::size_t files = 0;
  for (const auto& e : fs::directory_iterator(dir)) files += e.is_regular_file() && e.path().filename().string()[0] != '.';
  CHECK(files == 2);
  // the summary CSV: only over a summary CSV
  const fs::path table = dir / "table.csv";
  std::ofstream(table) << "a,b\n1,2\n";
  CHECK_THROWS_AS(write_summary_csv(table.string(), std::string(summary_csv_signature) + "x\n"), Error);
  fs::remove(table);
  write_summary_csv(table.string(), std::string(summary_csv_signature) + "x\n");
  write_summary_csv(table.string(), std::string(summary_csv_signature) + "y\n");
  // and never over an input of the run
  CHECK_THROWS_AS(write_report(table.string(), "x", {table.string()}), Error);
  fs::remove_all(dir);
}

TEST_CASE("the summary CSV numbers charges from 1 and states units in its header") {
  const CaseFile c = load_case(ACIDLOAD_SOURCE_DIR "/cases/drifting-gas.yaml");
  std::vector<VariantSummary> rows;
  for (const EngineCase& v : c.variants) rows.push_back(summarize(v));
  const std::string csv = summary_csv(c, rows);
  const std::string header = csv.substr(0, csv.find('\n'));
  CHECK(header.find("drain interval [h]") != std::string::npos);
  CHECK(header.find("TBN at end [mg KOH/g]") != std::string::npos);
  std::istringstream in(csv);
  std::string line;
  std::getline(in, line);
  std::size_t n = 0;
  int first_charge = 0;
  while (std::getline(in, line)) {
    const auto a = line.find(',');
    const auto b = line.find(',', a + 1);
    if (n++ == 0) first_charge = std::stoi(line.substr(a + 1, b - a - 1));
  }
  std::size_t charges = 0;
  for (const VariantSummary& v : rows) charges += v.run.charges.size();
  CHECK(n == charges);
  CHECK(first_charge == 1);
}

TEST_CASE("the fitted band is zero without covariance and widens with it") {
  const CaseFile c = load_case(ACIDLOAD_SOURCE_DIR "/cases/demo-site.yaml");
  FitResult f;
  f.fitted = c.variants.front();
  const TrajectoryBand none = trajectory_band(f);
  REQUIRE(!none.tan.value.empty());
  for (std::size_t i = 0; i < none.tan.value.size(); ++i) CHECK(none.tan.high[i] == none.tan.value[i]);
  FittedParameter p;
  p.key = "model.oxidation-rate";
  p.estimate = get_parameter(f.fitted, p.key);
  p.fit_estimate = to_fit_space(parameter(p.key), p.estimate);
  f.parameters = {p};
  f.covariance = {{0.01}};  // σ of ln k_ox = 0.1
  const TrajectoryBand b = trajectory_band(f);
  // oxidation is nearly proportional to k_ox: the band's half-width is about z·0.1·value (first order)
  const std::size_t last = b.oxidation.value.size() - 1;
  CHECK(b.oxidation.high[last] - b.oxidation.value[last] == doctest::Approx(b.z * 0.1 * b.oxidation.value[last]).epsilon(0.1));
  CHECK(b.oxidation.low[last] < b.oxidation.value[last]);
}

namespace {

// Every horizontal text of an SVG (rotated ones, the y-axis label, left out) as the box the writer
// reckons for it, from the element's own x, y, text-anchor and font-size.
std::vector<std::pair<std::string, svg::Box>> text_boxes(const std::vector<XmlElement>& all) {
  std::vector<std::pair<std::string, svg::Box>> out;
  for (const XmlElement* t : with(all, "text")) {
    if (t->attributes.count("transform")) continue;
    out.emplace_back(t->text, svg::text_box(std::stod(t->attributes.at("x")), std::stod(t->attributes.at("y")), t->text,
                                            t->attributes.at("text-anchor"), std::stod(t->attributes.at("font-size"))));
  }
  return out;
}

void check_no_overlap(const std::string& svg_text, const std::string& what) {
  const auto boxes = text_boxes(parse_xml(svg_text));
  for (std::size_t i = 0; i < boxes.size(); ++i)
    for (std::size_t j = i + 1; j < boxes.size(); ++j)
      CHECK_MESSAGE(!svg::overlap(boxes[i].second, boxes[j].second),
                    what << ": '" << boxes[i].first << "' overlaps '" << boxes[j].first << "'");
}

// Each <svg>…</svg> of a page, by its id.
std::map<std::string, std::string> charts_of(const std::string& html) {
  std::map<std::string, std::string> out;
  for (std::size_t at = html.find("<svg"); at != std::string::npos; at = html.find("<svg", at + 1)) {
    const std::size_t end = html.find("</svg>", at) + 6;
    const std::size_t id = html.find("id=\"", at) + 4;
    out[html.substr(id, html.find('"', id) - id)] = html.substr(at, end - at);
  }
  return out;
}

ReportData demo_report(const std::string& file) {
  const CaseFile c = load_case(std::string(ACIDLOAD_SOURCE_DIR "/cases/") + file);
  std::vector<VariantSummary> rows;
  for (const EngineCase& v : c.variants) rows.push_back(summarize(v));
  ReportOptions o;
  o.sweep_points = 5;
  o.generated = "test";
  return gather_report(c, rows, o);
}

}  // namespace

TEST_CASE("text boxes: width by characters, anchors, and overlap only with shared area") {
  const svg::Box b = svg::text_box(100, 50, "8000 h", "end", 10);
  CHECK(b.right == doctest::Approx(100));
  CHECK(b.left == doctest::Approx(100 - 6 * 6.2));
  CHECK(b.top == doctest::Approx(42.2));
  CHECK(b.bottom == doctest::Approx(52.4));
  CHECK(svg::text_box(100, 50, "°C", "middle", 10).left == doctest::Approx(100 - 6.2));  // code points, not bytes
  CHECK(svg::overlap(b, svg::text_box(90, 55, "x", "start", 10)));
  CHECK_FALSE(svg::overlap(b, svg::text_box(100, 50, "x", "start", 10)));  // touching at x = 100
}

TEST_CASE("crowded reference lines: every label placed, none overlapping another or leaving the frame") {
  // drain intervals bunched at the planned maximum and a limit line along the top, as happens when several
  // variants reach no limit: the labels "8000 h" used to sit on the limit's label
  svg::LineChart c = sample_chart();
  c.x_range = svg::Range{0, 8000};
  c.lines.clear();
  c.lines.push_back({svg::ReferenceLine::Direction::horizontal, 6.0, "TBN limit 6.00 (fresh)", -1});
  c.lines.push_back({svg::ReferenceLine::Direction::horizontal, 5.9, "planned maximum 8000 h", -1});
  for (double at : {8000.0, 8000.0, 7990.0, 7900.0, 1999.0, 1999.0, 1999.0, 2050.0})
    c.lines.push_back({svg::ReferenceLine::Direction::vertical, at, std::to_string(static_cast<int>(at)) + " h", 0});
  const std::string out = svg::line_chart(c);
  const auto all = parse_xml(out);
  CHECK(with(all, "text", "line-label").size() == c.lines.size());
  check_no_overlap(out, "crowded chart");
  const svg::Frame fr = svg::frame(c.width, c.height);
  for (const svg::PlacedLabel& p : svg::place_line_labels(c)) {
    CHECK(p.box.left >= fr.left);
    CHECK(p.box.right <= fr.right);
    CHECK(p.box.top >= fr.top);
    CHECK(p.box.bottom <= fr.bottom);
  }
}

TEST_CASE("no text label of any chart of the demo reports overlaps another") {
  for (const std::string file : {"demo-site.yaml", "demo-site-costs.yaml", "drifting-gas.yaml"})
    for (const auto& [id, chart] : charts_of(report_html(demo_report(file)))) check_no_overlap(chart, file + " " + id);
}

TEST_CASE("cost per MWh against the H2S at the engine: one marker per variant at its scaled values") {
  const ReportData d = demo_report("demo-site-costs.yaml");
  REQUIRE(d.costs.size() == 4);
  const auto charts = charts_of(report_html(d));
  REQUIRE(charts.count("chart-costs"));
  const auto all = parse_xml(charts.at("chart-costs"));
  bool x_label = false, y_label = false;
  for (const XmlElement* t : with(all, "text")) {
    x_label |= t->text.find("H2S at the engine") != std::string::npos;
    y_label |= t->text.find("total cost [EUR per MWh]") != std::string::npos;
  }
  CHECK(x_label);
  CHECK(y_label);
  CHECK(!with(all, "desc").empty());
  // both axes start at 0, so a marker's distance from the frame's left and bottom edges is
  // proportional to its values: raw gas (look 0, a circle) against the iron-oxide bed (look 1, a square)
  const svg::Frame fr = svg::frame(700, 320);
  const auto circles = with(all, "circle");
  REQUIRE(!circles.empty());
  const XmlElement* sq = nullptr;
  for (const XmlElement* r : with(all, "rect"))
    if (!sq && r->attributes.count("fill") && r->attributes.at("fill") == svg::look(1).ink) sq = r;  // the first: not the legend's
  REQUIRE(sq);
  const double cx0 = std::stod(circles[0]->attributes.at("cx")), cy0 = std::stod(circles[0]->attributes.at("cy"));
  const double half = std::stod(sq->attributes.at("width")) / 2;
  const double cx1 = std::stod(sq->attributes.at("x")) + half, cy1 = std::stod(sq->attributes.at("y")) + half;
  const VariantCosts &raw = d.costs[0], &bed = d.costs[1];
  CHECK((cx0 - fr.left) / (cx1 - fr.left) ==
        doctest::Approx(raw.scrubbed.mean_engine_h2s_ppmv / bed.scrubbed.mean_engine_h2s_ppmv).epsilon(0.01));
  CHECK((fr.bottom - cy0) / (fr.bottom - cy1) == doctest::Approx(raw.total_per_mwh / bed.total_per_mwh).epsilon(0.01));
  // the page without costs has no such chart
  CHECK(charts_of(report_html(demo_report("demo-site.yaml"))).count("chart-costs") == 0);
}

TEST_CASE("viscosity change against oil hours: the curve and its limit at their scaled values") {
  const ReportData d = demo_report("demo-site.yaml");
  const auto charts = charts_of(report_html(d));
  REQUIRE(charts.count("chart-viscosity"));
  REQUIRE(charts.count("chart-antioxidant"));
  const auto all = parse_xml(charts.at("chart-viscosity"));
  const svg::Frame fr = svg::frame(700, 320);
  const auto paths = with(all, "path", "series");
  REQUIRE(paths.size() == d.rows.size());
  const auto pts = path_points(paths[0]->attributes.at("d"));
  std::vector<double> rise;
  for (const TrajectoryPoint& p : d.rows[0].run.trajectory)
    if (p.charge == 0) rise.push_back(100 * p.viscosity_rise);
  REQUIRE(pts.size() == rise.size());
  const std::size_t k = rise.size() - 1;
  REQUIRE(rise[k] > 0);
  const auto limits = with(all, "line", "limit");
  REQUIRE(limits.size() == 1);
  // y from 0: heights above the bottom edge are proportional to the values (limit 20 % by default)
  const double limit = 100 * d.rows[0].charge.at_end[static_cast<std::size_t>(Limit::viscosity)].limit;
  CHECK(limit == doctest::Approx(20));
  CHECK((fr.bottom - std::stod(limits[0]->attributes.at("y1"))) / (fr.bottom - pts[k].second) ==
        doctest::Approx(limit / rise[k]).epsilon(0.01));
  // each variant's drain interval as a vertical line
  std::size_t reached = 0;
  for (const VariantSummary& v : d.rows) reached += v.charge.first.has_value();
  CHECK(with(all, "line", "interval").size() == reached);
}
