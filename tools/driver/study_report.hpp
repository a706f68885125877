// The files and terminal tables of a mesh-convergence study: per element order
// study.csv, study.json and one SVG plot per quantity; with several orders, a top-level
// study.json and study.csv that hold them all and a table comparing the orders.
#pragma once

#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "io/case.hpp"
#include "solver/convergence_study.hpp"

namespace hearth {

struct StudyQuantity {
  std::string name;  // dotted path into summary.json
  std::string unit;  // of the values ("" when not known, e.g. a --quantity)
  std::vector<StudyLevel> levels;  // coarse to fine; h in the case's length unit
};

struct OrderStudy {
  int element_order = 1;           // 1: 4-node, 2: 10-node tetrahedra
  std::filesystem::path dir;       // where its levels are and its files go
  std::string levels_by;           // "remeshing" or "splitting"
  std::vector<StudyQuantity> quantities;
};

// Writes dir/study.csv (quantity, level, size, dofs, value), dir/study.json and
// dir/NAME.svg for one order, prints its table to stdout (under a heading naming the
// order when `heading`), and returns the study.json object.
nlohmann::json write_order_study(const Case& c, const OrderStudy& study, const std::string& command_line,
                                 bool heading);

// Several orders: dir/study.json {element_orders, studies {order_P: the order's
// study.json}, comparison {NAME: ...}}, dir/study.csv with an `order` column, and the
// comparison table on stdout. `studies` as returned by write_order_study, same order.
void write_order_comparison(const Case& c, const std::filesystem::path& dir, const std::vector<OrderStudy>& orders,
                            const std::vector<nlohmann::json>& studies, const std::string& command_line);

// Folder name of an order's levels in a study of several orders: "order_1", "order_2".
std::string order_folder(int element_order);

}  // namespace hearth
