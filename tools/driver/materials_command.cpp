// hearth materials: lists the shipped material library (name, description, conductivity
// at the ends of its table, density, specific heat, source) and where it was read from.
#include <cstdio>
#include <string>

#include "io/case.hpp"
#include "io/material_library.hpp"
#include "tools/driver/commands.hpp"

namespace hearth {

namespace {

std::string number(double x) {
  char text[32];
  std::snprintf(text, sizeof text, "%.6g", x);
  return text;
}

std::string at_temperature(double kelvin) {
  return number(kelvin) + " K (" + number(kelvin - kelvin_offset) + " degC)";
}

std::string conductivity_summary(const Conductivity& k) {
  const PiecewiseLinear& table = k.principal[0];
  if (table.is_constant()) return number(table.y.empty() ? 0.0 : table.y.front()) + " W/(m K), constant";
  return number(table.y.front()) + " W/(m K) at " + at_temperature(table.x.front()) + " to " + number(table.y.back()) +
         " W/(m K) at " + at_temperature(table.x.back()) + ", " + std::to_string(table.x.size()) +
         "-row table";
}

std::string located(const std::string& how) {
  if (how == "HEARTH_DATA_DIR") return "named by HEARTH_DATA_DIR";
  if (how == "installed") return "installed with hearth";
  if (how == "source tree") return "source tree of this build";
  return how;
}

}  // namespace

int materials_command() {
  const MaterialLibrary library = load_material_library();
  std::printf("Material library: %s (%s), %zu entries\n", library.file.string().c_str(),
              located(library.located_by).c_str(), library.materials.size());
  std::printf("Library values are typical handbook values, not a supplier's data: check them against the data sheet\n"
              "of the product you use. In a case file: materials: {NAME: {library: ENTRY}}; conductivity, density,\n"
              "specific_heat or max_service_temperature given beside library: override the entry's value.\n"
              "Tables are in kelvin, linear between rows and held constant beyond their ends.\n");
  for (const LibraryMaterial& m : library.materials) {
    std::printf("\n%s: %s\n", m.name.c_str(), m.description.c_str());
    std::printf("  conductivity   %s\n", conductivity_summary(m.conductivity).c_str());
    std::printf("  density        %s\n", m.density ? (number(*m.density) + " kg/m3").c_str() : "not given");
    std::printf("  specific heat  %s\n", m.specific_heat ? (number(*m.specific_heat) + " J/(kg K)").c_str() : "not given");
    if (m.max_service_temperature)
      std::printf("  max service    %s\n", at_temperature(*m.max_service_temperature).c_str());
    std::printf("  source         %s\n", m.source.c_str());
  }
  return std::fflush(stdout) == 0 ? 0 : 3;
}

}  // namespace hearth
