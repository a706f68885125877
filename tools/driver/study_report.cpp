// Estimates per quantity (solver/convergence_study), written as the results contract
// of the design says, and the tables an engineer pastes into a report.
#include "tools/driver/study_report.hpp"

#include <cmath>
#include <cstdio>
#include <sstream>

#include "io/atomic_file.hpp"
#include "io/summary_json.hpp"
#include "io/svg_plot.hpp"

namespace hearth {

namespace fs = std::filesystem;

namespace {

std::string file_safe(const std::string& name) {
  std::string out;
  for (char c : name) out += (std::isalnum(static_cast<unsigned char>(c)) || c == '-' || c == '_') ? c : '_';
  return out;
}

const char* order_words(int element_order) { return element_order == 2 ? "10-node" : "4-node"; }

// A CSV row's values after the quantity's name, at 12 significant digits.
std::string csv_row(const std::string& name, std::size_t level, const StudyLevel& l) {
  std::ostringstream row;
  row.precision(12);
  row << name << ',' << level << ',' << l.h << ',' << l.dofs << ',' << l.value;
  return row.str();
}

double number_or_nan(const nlohmann::json& j) { return j.is_number() ? j.get<double>() : std::nan(""); }

}  // namespace

std::string order_folder(int element_order) { return "order_" + std::to_string(element_order); }

nlohmann::json write_order_study(const Case& c, const OrderStudy& study, const std::string& command_line,
                                 bool heading) {
  const int formal_order = study.element_order + 1;  // L2 and point values; heat rates no lower
  nlohmann::json out = {{"case_file", c.file.string()},
                        {"command_line", command_line},
                        {"length_unit", c.units.length},
                        {"temperature_unit", c.units.temperature},
                        {"element_order", study.element_order},
                        {"levels_by", study.levels_by},
                        {"formal_order", formal_order},
                        {"quantities", nlohmann::json::object()}};
  std::string csv = "quantity,level,size,dofs,value\n";
  if (heading)
    std::printf("\norder %d (%s tetrahedra), levels in %s", study.element_order, order_words(study.element_order),
                study.dir.c_str());
  std::printf("\n%-44s %14s %10s %14s %10s  %s\n", "quantity", "finest", "order", "extrapolated", "GCI fine",
              "status");
  double safety_factor = 1.25;
  for (const auto& q : study.quantities) {
    const ConvergenceEstimate e = estimate_convergence(q.levels, formal_order);
    safety_factor = e.safety_factor;
    nlohmann::json entry = {{"unit", q.unit},
                            {"h", nlohmann::json::array()},
                            {"dofs", nlohmann::json::array()},
                            {"values", nlohmann::json::array()},
                            {"observed_order", e.observed_order},
                            {"triplet_orders", e.triplet_orders},
                            {"extrapolated", e.extrapolated},
                            {"gci_fine", e.gci_fine},
                            {"gci_medium", e.gci_medium},
                            {"asymptotic_ratio", e.asymptotic_ratio},
                            {"asymptotic_range", to_string(e.asymptotic_range)},
                            {"safety_factor", e.safety_factor},
                            {"status", e.status}};
    ConvergencePlot plot{q.name, q.unit, {}, {}, e.extrapolated, e.observed_order, c.units.length};
    for (std::size_t k = 0; k < q.levels.size(); ++k) {
      entry["h"].push_back(q.levels[k].h);
      entry["dofs"].push_back(q.levels[k].dofs);
      entry["values"].push_back(q.levels[k].value);
      plot.h.push_back(q.levels[k].h);
      plot.values.push_back(q.levels[k].value);
      csv += csv_row(q.name, k, q.levels[k]) + "\n";
    }
    out["quantities"][q.name] = entry;
    write_convergence_svg(study.dir / (file_safe(q.name) + ".svg"), plot);
    std::printf("%-44s %14.6g %10.3g %14.6g %9.3g%%  %s\n", q.name.c_str(), q.levels.back().value, e.observed_order,
                e.extrapolated, 100.0 * e.gci_fine, e.status.c_str());
  }
  write_text_file(study.dir / "study.csv", csv);
  write_summary(study.dir / "study.json", out);
  std::printf("\nlevels in %s (level_0 coarsest, by %s); GCI with a factor of safety of %.3g; an engineering "
              "estimate of the discretisation error only, to be checked by a qualified person\n",
              study.dir.c_str(), study.levels_by.c_str(), safety_factor);
  return out;
}

void write_order_comparison(const Case& c, const fs::path& dir, const std::vector<OrderStudy>& orders,
                            const std::vector<nlohmann::json>& studies, const std::string& command_line) {
  nlohmann::json out = {{"case_file", c.file.string()},
                        {"command_line", command_line},
                        {"length_unit", c.units.length},
                        {"temperature_unit", c.units.temperature},
                        {"element_orders", nlohmann::json::array()},
                        {"studies", nlohmann::json::object()},
                        {"comparison", nlohmann::json::object()}};
  std::string csv = "quantity,level,size,dofs,value,order\n";
  for (std::size_t i = 0; i < orders.size(); ++i) {
    const std::string key = order_folder(orders[i].element_order);
    out["element_orders"].push_back(orders[i].element_order);
    out["studies"][key] = studies[i];
    for (const auto& q : orders[i].quantities)
      for (std::size_t k = 0; k < q.levels.size(); ++k)
        csv += csv_row(q.name, k, q.levels[k]) + "," + std::to_string(orders[i].element_order) + "\n";
  }

  // The finest value of each order with its GCI band phi (1 +- GCI): do the bands overlap?
  std::printf("\ncomparison of the element orders: finest level of each, +- its GCI\n");
  std::printf("%-44s", "quantity");
  for (const auto& o : orders) std::printf(" %22s", ("order " + std::to_string(o.element_order)).c_str());
  std::printf(" %11s  %s\n", "difference", "bands overlap");
  const auto& first = orders.front().quantities;
  for (std::size_t qi = 0; qi < first.size(); ++qi) {
    const std::string& name = first[qi].name;
    nlohmann::json entry = {{"unit", first[qi].unit},
                            {"finest", nlohmann::json::object()},
                            {"gci_fine", nlohmann::json::object()},
                            {"extrapolated", nlohmann::json::object()}};
    double low = -INFINITY, high = INFINITY;  // intersection of the bands
    bool all_bands = true;
    std::printf("%-44s", name.c_str());
    for (std::size_t i = 0; i < orders.size(); ++i) {
      const std::string key = order_folder(orders[i].element_order);
      const nlohmann::json& quantities = studies[i].at("quantities");
      if (!quantities.contains(name)) {  // not in this order's summaries
        all_bands = false;
        std::printf(" %22s", "-");
        continue;
      }
      const nlohmann::json& q = quantities.at(name);
      const double finest = q["values"].back().get<double>();
      const double gci = number_or_nan(q["gci_fine"]);
      entry["finest"][key] = finest;
      entry["gci_fine"][key] = q["gci_fine"];
      entry["extrapolated"][key] = q["extrapolated"];
      if (std::isfinite(gci)) {
        low = std::max(low, finest - gci * std::abs(finest));
        high = std::min(high, finest + gci * std::abs(finest));
      } else {
        all_bands = false;
      }
      char cell[64];
      if (std::isfinite(gci))
        std::snprintf(cell, sizeof cell, "%.6g +- %.2g%%", finest, 100 * gci);
      else
        std::snprintf(cell, sizeof cell, "%.6g", finest);
      std::printf(" %22s", cell);
    }
    const std::string first_key = order_folder(orders.front().element_order);
    const std::string last_key = order_folder(orders.back().element_order);
    const double a = entry["finest"].contains(first_key) ? entry["finest"][first_key].get<double>() : std::nan("");
    const double b = entry["finest"].contains(last_key) ? entry["finest"][last_key].get<double>() : std::nan("");
    const double difference = b != 0 ? (b - a) / std::abs(b) : std::nan("");
    entry["relative_difference"] = difference;
    if (all_bands)
      entry["bands_overlap"] = low <= high;
    else
      entry["bands_overlap"] = nullptr;
    std::printf(" %10.3g%%  %s\n", 100 * difference,
                !all_bands ? "-" : (low <= high ? "yes" : "no"));
    out["comparison"][name] = entry;
  }
  write_text_file(dir / "study.csv", csv);
  write_summary(dir / "study.json", out);
  std::printf("\ndifference: (last order - first order) / |last order| of the finest values; bands overlap: "
              "the finest values agree within their GCIs\n");
}

}  // namespace hearth
