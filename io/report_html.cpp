// The report page: HTML written by hand from the result files' JSON; print CSS inline.
#include "io/report_html.hpp"

#include <vtkBase64Utilities.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <set>
#include <sstream>

#include "io/colour_map.hpp"
#include "io/nice_numbers.hpp"
#include "io/svg_canvas.hpp"

namespace hearth {

namespace {

using nlohmann::json;

const char* const kCaution =
    "These results are an engineering estimate from a finite-element model. They depend on the inputs "
    "(material properties, film coefficients, emissivities, geometry, mesh) and must be checked by a qualified "
    "person against local codes and practice before they are used for design or safety decisions.";

const char* const kStyle = R"(
:root { --ink: #111; --rule: #b9b9b9; --soft: #f3f3f3; }
* { box-sizing: border-box; }
body { font-family: "DejaVu Sans", Arial, Helvetica, sans-serif; font-size: 10.5pt; line-height: 1.4;
       color: var(--ink); max-width: 200mm; margin: 0 auto; padding: 8mm 6mm; background: white; }
h1 { font-size: 18pt; margin: 0 0 2mm; }
h2 { font-size: 13pt; margin: 8mm 0 2mm; padding-bottom: 1mm; border-bottom: 1.5pt solid #333;
     break-after: avoid; page-break-after: avoid; }
h3 { font-size: 11pt; margin: 5mm 0 1mm; break-after: avoid; page-break-after: avoid; }
p.meta { margin: 0 0 3mm; color: #333; }
table { border-collapse: collapse; width: 100%; margin: 1mm 0 4mm; font-size: 9.5pt; }
thead { display: table-header-group; }
tr { break-inside: avoid; page-break-inside: avoid; }
th, td { border: 0.6pt solid var(--rule); padding: 1mm 2mm; text-align: left; vertical-align: top; }
th { background: var(--soft); font-weight: bold; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
.box { border: 1pt solid #555; padding: 2mm 4mm; margin: 3mm 0; break-inside: avoid; page-break-inside: avoid;
       -webkit-print-color-adjust: exact; print-color-adjust: exact; }
.warnings { border: 2pt solid #a30000; background: #fdeceb; }
.warnings h2 { margin-top: 1mm; border: none; color: #a30000; }
.warnings li { margin: 1mm 0; }
.no-warnings { border-color: #2e6b2e; background: #eef6ee; }
.caution { background: var(--soft); }
figure { margin: 3mm 0 6mm; break-inside: avoid; page-break-inside: avoid; }
figure img, figure svg { display: block; max-width: 100%; height: auto; border: 0.6pt solid var(--rule); }
figcaption { font-size: 9pt; color: #333; margin-top: 1.5mm; }
.exceeded { color: #a30000; font-weight: bold; }
footer { margin-top: 8mm; font-size: 8.5pt; color: #444; border-top: 0.6pt solid var(--rule); padding-top: 2mm; }
@page { size: A4; margin: 12mm 11mm; }
@media print {
  body { max-width: none; padding: 0; font-size: 9.5pt; }
  figure.picture { break-before: auto; }
  a { color: inherit; text-decoration: none; }
}
)";

std::string esc(const std::string& text) { return xml_escape(text); }

std::string symbol_of(const std::string& unit) { return temperature_symbol(unit); }

// The member `key` of an object, or null when there is none.
const json& at(const json& j, const std::string& key) {
  static const json none;
  if (!j.is_object()) return none;
  const auto it = j.find(key);
  return it == j.end() ? none : *it;
}

// A name as one token of a JSON pointer (RFC 6901: '~' as "~0", '/' as "~1").
std::string token(const std::string& name) {
  std::string out;
  for (char c : name) out += c == '~' ? "~0" : c == '/' ? "~1" : std::string(1, c);
  return out;
}

// The JSON number at a pointer, if there is one.
std::optional<double> number_at(const json& j, const std::string& pointer) {
  const json::json_pointer p(pointer);
  if (!j.is_object() || !j.contains(p)) return std::nullopt;
  const json& v = j.at(p);
  if (!v.is_number()) return std::nullopt;
  return v.get<double>();
}

std::string text_at(const json& j, const std::string& pointer, const std::string& fallback = "") {
  const json::json_pointer p(pointer);
  if (!j.is_object() || !j.contains(p)) return fallback;
  const json& v = j.at(p);
  if (v.is_string()) return v.get<std::string>();
  if (v.is_null()) return fallback;
  return v.dump();
}

std::string num(const std::optional<double>& v, int digits = 6) {
  return v && std::isfinite(*v) ? short_number(*v, digits) : "&ndash;";
}

std::string point_text(const json& p) {
  if (!p.is_array() || p.size() != 3) return "&ndash;";
  return "(" + short_number(p[0].get<double>(), 5) + ", " + short_number(p[1].get<double>(), 5) + ", " +
         short_number(p[2].get<double>(), 5) + ")";
}

// A table; `numeric` marks right-aligned columns. Cells are HTML already.
std::string table(const std::vector<std::string>& headers, const std::vector<std::vector<std::string>>& rows,
                  const std::set<std::size_t>& numeric) {
  std::ostringstream out;
  out << "<table><thead><tr>";
  for (const auto& h : headers) out << "<th>" << h << "</th>";
  out << "</tr></thead><tbody>\n";
  for (const auto& row : rows) {
    out << "<tr>";
    for (std::size_t k = 0; k < row.size(); ++k)
      out << (numeric.count(k) ? "<td class=\"num\">" : "<td>") << row[k] << "</td>";
    out << "</tr>\n";
  }
  out << "</tbody></table>\n";
  return out.str();
}

// "table in time: 0 s &rarr; 20 °C; ..." for {vs_time: [[t, v], ...]}; `unit` follows each value.
std::string time_table_text(const json& p, const std::string& unit) {
  std::string text = "table in time: ";
  bool first = true;
  for (const auto& row : at(p, "vs_time")) {
    text += (first ? "" : "; ") + short_number(row[0].get<double>(), 6) + " s &rarr; " +
            short_number(row[1].get<double>(), 6) + (unit.empty() ? "" : " " + unit);
    first = false;
  }
  return text + " (linear between rows)";
}

// A boundary value: "<at> 30 °C" for a number, "<following> a table in time: ..." for a table.
std::string value_text(const json& v, const std::string& unit, const std::string& at = "",
                       const std::string& following = "") {
  const auto join = [](const std::string& a, const std::string& b) { return a.empty() ? b : a + " " + b; };
  if (v.is_object() && v.contains("vs_time")) return join(following, time_table_text(v, unit));
  if (v.is_number()) return join(at, short_number(v.get<double>(), 6) + (unit.empty() ? "" : " " + unit));
  return "&ndash;";
}

// A property that is a number or {vs_temperature: [[T, v], ...]} (or, for a film
// coefficient, {vs_time: ...}).
std::string property_text(const json& p, const std::string& t_symbol) {
  if (p.is_number()) return short_number(p.get<double>(), 6);
  if (p.is_object() && p.contains("vs_time")) return time_table_text(p, "");
  if (p.is_object() && p.contains("vs_temperature")) {
    std::string text = "table in temperature: ";
    bool first = true;
    for (const auto& row : at(p, "vs_temperature")) {
      text += (first ? "" : "; ") + short_number(row[0].get<double>(), 6) + " " + t_symbol + " &rarr; " +
              short_number(row[1].get<double>(), 6);
      first = false;
    }
    return text + " (linear between rows, constant beyond)";
  }
  return "&ndash;";
}

std::string vector_text(const json& v) {
  if (!v.is_array()) return "";
  std::string text = "(";
  for (std::size_t k = 0; k < v.size(); ++k) text += (k ? ", " : "") + short_number(v[k].get<double>(), 4);
  return text + ")";
}

std::string conductivity_text(const json& k, const std::string& t_symbol) {
  const std::string kind = text_at(k, "/kind");
  if (kind == "isotropic") return property_text(at(k, "value"), t_symbol);
  if (kind == "orthotropic") {
    std::string text = "orthotropic: ";
    for (std::size_t i = 0; i < 3; ++i)
      text += (i ? "; " : "") + std::string("k") + std::to_string(i + 1) + " = " +
              property_text(at(k, "principal")[i], t_symbol) + " along " + vector_text(at(k, "axes")[i]);
    return text;
  }
  if (kind == "tensor") {
    std::string text = "tensor: ";
    for (std::size_t i = 0; i < 3; ++i) text += (i ? ", " : "") + vector_text(at(k, "tensor")[i]);
    return text;
  }
  return "&ndash;";
}

std::string condition_values(const json& b, const std::string& t_symbol) {
  std::vector<std::string> parts;
  if (b.contains("temperature"))
    parts.push_back("temperature " + value_text(at(b, "temperature"), t_symbol, "held at", "following"));
  if (b.contains("convection"))
    parts.push_back("convection: h = " + property_text(at(at(b, "convection"), "coefficient"), t_symbol) +
                    " W/(m&sup2;&nbsp;K), fluid " +
                    value_text(at(at(b, "convection"), "ambient"), t_symbol, "at", "temperature following"));
  if (b.contains("radiation"))
    parts.push_back("radiation: emissivity " + num(number_at(b, "/radiation/emissivity")) + ", surroundings " +
                    value_text(at(at(b, "radiation"), "surroundings"), t_symbol, "at", "following"));
  if (b.contains("heat_flux"))
    parts.push_back("heat flux into the body " + value_text(at(b, "heat_flux"), "W/m&sup2;", "", "following"));
  std::string text;
  for (const auto& p : parts) text += (text.empty() ? "" : "<br>") + p;
  return text;
}

struct Page {
  const ReportPage& in;
  const ResultFolder& r;
  const json& s;  // summary.json
  std::string t;  // temperature symbol
  std::string L;  // length unit
  std::ostringstream out;

  explicit Page(const ReportPage& page)
      : in(page), r(*page.result), s(page.result->summary),
        t(symbol_of(text_at(page.result->summary, "/temperature_unit", "degC"))),
        L(text_at(page.result->summary, "/length_unit", "m")) {}

  std::vector<std::string> warnings() const {
    std::vector<std::string> list;
    if (!r.converged)
      list.push_back("The solve did not converge (" + text_at(s, "/solve/failure", "no reason given") +
                     "). The figures below come from the last iterate and must not be used.");
    if (s.contains("warnings"))
      for (const auto& w : at(s, "warnings")) list.push_back(w.get<std::string>());
    if (in.study && in.study->study.contains("quantities"))
      for (const auto& [name, q] : at(in.study->study, "quantities").items()) {
        const std::string status = text_at(q, "/status");
        if (status.rfind("oscillatory", 0) == 0 || status.rfind("divergent", 0) == 0)
          list.push_back("mesh study: " + name + " is " + status + "; the mesh is not fine enough to judge its "
                         "discretisation error");
      }
    return list;
  }

  void header() {
    const std::string title = text_at(s, "/title");
    out << "<h1>" << esc(title.empty() ? "hearth result" : title) << "</h1>\n<p class=\"meta\">";
    out << "Case file: " << esc(text_at(r.run, "/case_file", text_at(s, "/case_file", "unknown"))) << "<br>";
    out << (r.field_time ? "Transient" : "Steady") << " result";
    if (!text_at(r.run, "/finished").empty()) out << " finished " << esc(text_at(r.run, "/finished"));
    out << " by hearth " << esc(text_at(s, "/hearth_version", "unknown")) << "; report made " << esc(in.made_at)
        << " by hearth " << esc(in.hearth_version) << "<br>Results folder: " << esc(r.directory.string())
        << "</p>\n";
  }

  void warnings_box() {
    const auto list = warnings();
    if (list.empty()) {
      out << "<div class=\"box no-warnings\"><strong>Warnings:</strong> none (service temperatures, touch limits "
             "and the solve were checked).</div>\n";
      return;
    }
    out << "<div class=\"box warnings\"><h2>Warnings (" << list.size() << ")</h2><ul>\n";
    for (const auto& w : list) out << "<li>" << esc(w) << "</li>\n";
    out << "</ul></div>\n";
  }

  void caution() { out << "<div class=\"box caution\"><strong>Caution.</strong> " << kCaution << "</div>\n"; }

  void inputs_tables() {
    out << "<h2>Materials and boundary conditions as solved</h2>\n";
    const json& in_json = r.inputs;
    if (!in_json.is_object() || in_json.empty()) {
      out << "<p>This results folder has no inputs.json (it was written by an earlier hearth), so the materials "
             "and the values of the boundary conditions are not shown; run the case again to have them.</p>\n";
    } else {
      std::vector<std::vector<std::string>> rows;
      for (const auto& [name, m] : at(in_json, "materials").items()) {
        std::string regions;
        for (const auto& region : at(m, "regions")) regions += (regions.empty() ? "" : ", ") + esc(region.get<std::string>());
        rows.push_back({esc(name), regions.empty() ? "(not used)" : regions, conductivity_text(at(m, "conductivity"), t),
                        property_text(at(m, "density"), t), property_text(at(m, "specific_heat"), t),
                        num(number_at(m, "/max_service_temperature")),
                        at(m, "library").is_string() ? "library entry " + esc(at(m, "library").get<std::string>())
                                                 : "case file"});
      }
      out << "<h3>Materials</h3>\n"
          << table({"material", "regions", "conductivity W/(m&nbsp;K)", "density kg/m&sup3;",
                    "specific heat J/(kg&nbsp;K)", "max. service temperature " + t, "from"},
                   rows, {5});
    }
    std::vector<std::vector<std::string>> rows;
    for (const auto& [name, b] : at(s, "boundaries").items()) {
      const std::string condition = text_at(b, "/condition", b.value("internal", false) ? "internal" : "");
      std::string values;
      if (in_json.is_object() && in_json.contains("boundaries") && at(in_json, "boundaries").contains(name))
        values = condition_values(at(at(in_json, "boundaries"), name), t);
      if (in_json.is_object() && in_json.contains("interfaces") && at(in_json, "interfaces").contains(name))
        values = "contact conductance " + num(number_at(at(at(in_json, "interfaces"), name), "/conductance")) +
                 " W/(m&sup2;&nbsp;K)";
      if (condition == "insulated") values = "no heat crosses it (not listed under boundaries)";
      if (condition == "internal") values = "internal surface: the heat rate across it is reported, positive "
                                            "along its normal";
      rows.push_back({esc(name), esc(condition), values});
    }
    out << "<h3>Boundaries</h3>\n" << table({"boundary", "condition", "values"}, rows, {});
    if (in_json.is_object() && in_json.contains("heat_sources") && !at(in_json, "heat_sources").empty()) {
      std::vector<std::vector<std::string>> sources;
      for (const auto& [name, q] : at(in_json, "heat_sources").items())
        sources.push_back({esc(name), value_text(q, "")});
      out << "<h3>Heat sources</h3>\n" << table({"region", "heat generated W/m&sup3;"}, sources, {1});
    }
  }

  void mesh_and_solve() {
    out << "<h2>Mesh and solution</h2>\n";
    std::vector<std::vector<std::string>> rows = {
        {"nodes", num(number_at(s, "/mesh/nodes"), 12)},
        {"elements (tetrahedra)", num(number_at(s, "/mesh/elements"), 12)},
        {"element order", num(number_at(s, "/mesh/order")) + (number_at(s, "/mesh/order") == 2.0 ? " (10-node)" : " (4-node)")},
        {"smallest element quality (gamma, 0..1)", num(number_at(s, "/mesh/min_quality"), 4)},
        {"unknowns", num(number_at(s, "/solve/dofs"), 12)},
        {"linear solver", esc(text_at(s, "/solve/linear_solver"))},
        {"linear iterations", num(number_at(s, "/solve/linear_iterations"), 12)},
        {"Newton iterations", num(number_at(s, "/solve/nonlinear_iterations"), 12)},
        {"relative residual of the last linear solve", num(number_at(s, "/solve/linear_relative_residual"), 3)},
        {"converged", r.converged ? "yes" : "<span class=\"exceeded\">no</span>"},
        {"solve time s", num(number_at(s, "/solve/seconds"), 3)}};
    if (const auto newton = number_at(s, "/solve/nonlinear_relative_residual"))
      rows.insert(rows.begin() + 9, {"relative residual of the heat balance (Newton)", num(newton, 3)});
    out << table({"quantity", "value"}, rows, {1});
    time_integration();
  }

  bool transient() const { return text_at(s, "/analysis/type") == "transient"; }

  void time_integration() {
    if (!transient()) return;
    const json& a = at(s, "analysis");
    const auto yes_no = [&](const char* key) -> std::string {
      return at(a, key).is_boolean() ? (at(a, key).get<bool>() ? "yes" : "no") : "&ndash;";
    };
    std::vector<std::vector<std::string>> rows = {
        {"method", esc(text_at(a, "/method")) + (at(a, "adaptive") == true ? ", adaptive steps" : ", fixed steps")},
        {"tolerance K per step", num(number_at(a, "/tolerance"))},
        {"duration s", num(number_at(a, "/duration"))},
        {"time reached s", num(number_at(a, "/end_time"))},
        {"completed", yes_no("completed")},
        {"accepted steps", num(number_at(a, "/steps"), 12)},
        {"steps redone smaller", num(number_at(a, "/rejected_steps"), 12) + " for the error estimate, " +
                                     num(number_at(a, "/failed_steps"), 12) + " after Newton failed"},
        {"starting field", esc(text_at(a, "/initial_temperature/from")) + ", " +
                               num(number_at(a, "/initial_temperature/min")) + " to " +
                               num(number_at(a, "/initial_temperature/max")) + " " + t},
        {"field files written", at(a, "fields").is_array() ? std::to_string(at(a, "fields").size()) : "&ndash;"}};
    out << "<h3>Time integration</h3>\n" << table({"quantity", "value"}, rows, {});
    const json& thresholds = at(s, "thresholds");
    if (!thresholds.is_object() || thresholds.empty()) return;
    std::vector<std::vector<std::string>> crossings;
    for (const auto& [name, th] : thresholds.items()) {
      std::string watched;
      for (const char* kind : {"probe", "region_max", "surface_mean"})
        if (th.contains(kind)) watched = std::string(kind) + " " + esc(text_at(th, std::string("/") + kind));
      const auto when = number_at(th, "/first_crossed_time");
      crossings.push_back({esc(name), watched, num(number_at(th, "/temperature")), num(number_at(th, "/start_value")),
                           when ? num(when) + " s (" + short_number(*when / 3600, 4) + " h)" : "not reached"});
    }
    out << "<h3>Thresholds</h3>\n"
        << table({"threshold", "watches", "temperature " + t, "at the start " + t, "first crossed"}, crossings, {2, 3});
  }

  void regions_and_boundaries() {
    out << "<h2>Temperatures and heat rates</h2>\n";
    std::vector<std::vector<std::string>> rows;
    for (const auto& [name, g] : at(s, "regions").items()) {
      const std::string material = text_at(r.inputs, "/regions/" + token(name));
      rows.push_back({esc(name), esc(material), num(number_at(g, "/volume")), num(number_at(g, "/temperature/min")),
                      num(number_at(g, "/temperature/mean")), num(number_at(g, "/temperature/max")),
                      num(number_at(g, "/heat_generated"))});
    }
    out << "<h3>Regions</h3>\n"
        << table({"region", "material", "volume m&sup3;", "min " + t, "mean " + t, "max " + t, "heat generated W"},
                 rows, {2, 3, 4, 5, 6});
    rows.clear();
    for (const auto& [name, b] : at(s, "boundaries").items())
      rows.push_back({esc(name), esc(text_at(b, "/condition")), num(number_at(b, "/area")),
                      num(number_at(b, "/heat_rate")), num(number_at(b, "/temperature/min")),
                      num(number_at(b, "/temperature/mean")), num(number_at(b, "/temperature/max"))});
    out << "<h3>Boundaries</h3>\n"
        << table({"boundary", "condition", "area m&sup2;", "heat rate W", "min " + t, "mean " + t, "max " + t}, rows,
                 {2, 3, 4, 5, 6})
        << "<p>Heat rates: positive into the body on outer surfaces; across an internal surface, positive along "
           "its normal." << (transient() ? " Temperatures and heat rates at the last time reached." : "")
        << "</p>\n";
    const json& e = at(s, "energy_balance");
    const std::string unit = esc(text_at(e, "/unit", "W"));  // J over a transient run
    out << "<h3>Energy balance</h3>\n"
        << table({"in through boundaries " + unit, "out through boundaries " + unit, "sources " + unit,
                  "stored " + unit, "relative imbalance"},
                 {{num(number_at(e, "/boundary_in")), num(number_at(e, "/boundary_out")), num(number_at(e, "/sources")),
                   num(number_at(e, "/stored")), num(number_at(e, "/relative_imbalance"), 3)}},
                 {0, 1, 2, 3, 4});
    if (!text_at(e, "/over").empty()) out << "<p>Over " << esc(text_at(e, "/over")) << ".</p>\n";
    if (s.contains("probes") && !at(s, "probes").empty()) {
      rows.clear();
      for (const auto& [name, p] : at(s, "probes").items())
        rows.push_back({esc(name), point_text(p.value("point", json())), num(number_at(p, "/temperature"))});
      out << "<h3>Probes</h3>\n" << table({"probe", "point " + L, "temperature " + t}, rows, {2});
    }
  }

  void safety() {
    const json sf = s.value("safety", json::object());
    const json service = sf.value("service", json::object()), touch = sf.value("touch", json::object());
    std::vector<std::vector<std::string>> rows;
    auto add = [&](const std::string& what, const std::string& name, const json& x) {
      const bool exceeded = x.value("exceeded", false);
      std::string when = "&ndash;";
      if (x.contains("first_exceeded_time") && at(x, "first_exceeded_time").is_number())
        when = num(at(x, "first_exceeded_time").get<double>()) + " s";
      rows.push_back({what, esc(name), num(number_at(x, "/max")), num(number_at(x, "/limit")),
                      point_text(x.value("location", json())),
                      exceeded ? "<span class=\"exceeded\">exceeded</span>" : "within", when});
    };
    for (const auto& [name, x] : service.items()) add("service temperature", name, x);
    for (const auto& [name, x] : touch.items()) add("touch limit", name, x);
    if (rows.empty()) return;
    out << "<h2>Limits</h2>\n"
        << table({"check", "material or surface", "highest " + t, "limit " + t, "where " + L, "result",
                  "first exceeded"},
                 rows, {2, 3})
        << "<p>The touch check is a screening aid: whether a surface is safe to touch depends on its material, "
           "the contact time and local rules.</p>\n";
  }

  void history() {
    if (!s.contains("history") || !at(s, "history").is_array() || at(s, "history").empty()) return;
    const json& h = at(s, "history");
    std::vector<std::string> regions;
    for (const auto& [name, g] : at(s, "regions").items()) regions.push_back(name);
    std::vector<std::string> boundaries;
    for (const auto& [name, b] : at(s, "boundaries").items())
      if (text_at(b, "/condition") != "insulated" && !b.value("internal", false)) boundaries.push_back(name);
    regions.resize(std::min<std::size_t>(regions.size(), 5));
    boundaries.resize(std::min<std::size_t>(boundaries.size(), 4));
    std::vector<std::string> headers = {"time s"};
    for (const auto& g : regions) headers.push_back("max " + t + " " + esc(g));
    for (const auto& b : boundaries) headers.push_back("heat rate W " + esc(b));
    std::vector<std::vector<std::string>> rows;
    const std::size_t n = h.size(), shown = std::min<std::size_t>(n, 25);
    std::size_t last = n;
    for (std::size_t k = 0; k < shown; ++k) {
      const std::size_t i = shown == 1 ? 0 : k * (n - 1) / (shown - 1);
      if (i == last) continue;
      last = i;
      const json& step = h[i];
      std::vector<std::string> row = {num(number_at(step, "/time"))};
      for (const auto& g : regions) {
        auto v = number_at(step, "/regions/" + token(g) + "/temperature/max");
        row.push_back(num(v ? v : number_at(step, "/regions/" + token(g) + "/max")));
      }
      for (const auto& b : boundaries) row.push_back(num(number_at(step, "/boundaries/" + token(b) + "/heat_rate")));
      rows.push_back(row);
    }
    std::set<std::size_t> numeric;
    for (std::size_t k = 0; k < headers.size(); ++k) numeric.insert(k);
    out << "<h2>History</h2>\n<p>" << n << " accepted steps" << (shown < n ? ", " + std::to_string(rows.size()) +
                                                                               " of them shown, evenly spaced"
                                                                         : std::string())
        << ". The pictures show the last written time.</p>\n"
        << table(headers, rows, numeric);
  }

  void pictures() {
    if (in.pictures.empty()) return;
    out << "<h2>Pictures</h2>\n<p>" << esc(colour_map_credit()) << " " << esc(in.notes) << "</p>\n";
    for (const auto& p : in.pictures)
      out << "<figure class=\"picture\"><h3>" << esc(p.heading) << "</h3><img src=\"data:image/png;base64,"
          << base64(p.png) << "\" width=\"" << p.width << "\" height=\"" << p.height << "\" alt=\""
          << esc(p.heading) << "\"><figcaption>" << esc(p.caption) << " (Also in " << esc(p.file_name)
          << ".)</figcaption></figure>\n";
  }

  static std::string inline_svg(std::string svg) {
    if (svg.rfind("<?xml", 0) == 0) svg = svg.substr(svg.find("?>") + 2);
    return svg;
  }

  void plots(const std::vector<ReportPlot>& list, const std::string& heading) {
    if (list.empty()) return;
    out << "<h2>" << heading << "</h2>\n";
    for (const auto& p : list)
      out << "<figure class=\"plot\"><h3>" << esc(p.heading) << "</h3>" << inline_svg(p.svg) << "<figcaption>"
          << esc(p.caption) << (p.file_name.empty() ? "" : " (Also in " + esc(p.file_name) + ".)")
          << "</figcaption></figure>\n";
  }

  void study() {
    if (!in.study) return;
    const json& st = in.study->study;
    out << "<h2>Mesh-convergence study</h2>\n<p>" << in.study->levels.size()
        << " meshes, coarse (level 0) to fine; the pictures and tables above are those of the finest level ("
        << esc(r.directory.filename().string()) << "). Formal order " << num(number_at(st, "/formal_order"))
        << "; the grid convergence index (GCI) is an estimate of the discretisation error only.</p>\n";
    std::vector<std::vector<std::string>> rows;
    const json quantities = st.value("quantities", json::object());
    for (const auto& [name, q] : quantities.items()) {
      std::string values;
      const json level_values = q.value("values", json::array());
      for (const auto& v : level_values)
        values += (values.empty() ? "" : ", ") + (v.is_number() ? short_number(v.get<double>(), 7) : "&ndash;");
      const auto gci = number_at(q, "/gci_fine");
      rows.push_back({esc(name), esc(text_at(q, "/unit")), values, num(number_at(q, "/observed_order"), 3),
                      num(number_at(q, "/extrapolated"), 7), gci ? short_number(100 * *gci, 3) + " %" : "&ndash;",
                      esc(text_at(q, "/status"))});
    }
    out << table({"quantity", "unit", "values, coarse to fine", "observed order", "extrapolated", "GCI fine", "status"},
                 rows, {3, 4, 5});
  }

  void provenance() {
    out << "<h2>Provenance</h2>\n";
    if (!r.run.is_object() || r.run.empty()) {
      out << "<p>No run.json in the results folder.</p>\n";
      return;
    }
    std::vector<std::vector<std::string>> rows;
    for (const auto& [key, value] : r.run.items()) {
      if (value.is_object()) {
        for (const auto& [sub, v] : value.items())
          rows.push_back({esc(key + "." + sub), esc(v.is_string() ? v.get<std::string>() : v.dump())});
      } else if (value.is_array()) {
        std::string text;
        for (const auto& v : value) text += (text.empty() ? "" : " ") + (v.is_string() ? v.get<std::string>() : v.dump());
        rows.push_back({esc(key), text.empty() ? "(none)" : esc(text)});
      } else {
        rows.push_back({esc(key), esc(value.is_string() ? value.get<std::string>() : value.dump())});
      }
    }
    out << "<p>From run.json: how the result was made, so that it can be made again.</p>\n"
        << table({"item", "value"}, rows, {});
  }

  std::string build() {
    const std::string title = text_at(s, "/title");
    out << "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
        << "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n"
        << "<meta name=\"generator\" content=\"hearth " << esc(in.hearth_version) << "\">\n"
        << "<title>" << esc(title.empty() ? "hearth result" : title) << "</title>\n<style>" << kStyle
        << "</style>\n</head>\n<body>\n";
    header();
    warnings_box();
    caution();
    inputs_tables();
    mesh_and_solve();
    regions_and_boundaries();
    safety();
    history();
    pictures();
    plots(in.plots, "Plots");
    study();
    plots(in.study_plots, "Convergence plots");
    provenance();
    out << "<footer><p>" << kCaution << "</p><p>Temperatures in " << t << ", lengths in " << esc(L)
        << ", everything else in SI units. Made by hearth " << esc(in.hearth_version)
        << " from the files in the results folder.</p></footer>\n</body>\n</html>\n";
    return out.str();
  }
};

}  // namespace

std::string base64(const std::vector<unsigned char>& bytes) {
  if (bytes.empty()) return "";
  std::string text(4 * ((bytes.size() + 2) / 3) + 1, '\0');
  const unsigned long n = vtkBase64Utilities::Encode(bytes.data(), static_cast<unsigned long>(bytes.size()),
                                                     reinterpret_cast<unsigned char*>(text.data()), 0);
  text.resize(n);
  return text;
}

std::string report_html(const ReportPage& page) { return Page(page).build(); }

}  // namespace hearth
