// VTK's XML reader and a static cell locator over the read grid.
#include "io/field_grid.hpp"

#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkFieldData.h>
#include <vtkGenericCell.h>
#include <vtkIdList.h>
#include <vtkPointData.h>
#include <vtkSmartPointer.h>
#include <vtkStaticCellLocator.h>
#include <vtkStringArray.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridReader.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <vector>

#include "io/input_error.hpp"

namespace hearth {

struct FieldGrid::Impl {
  vtkSmartPointer<vtkUnstructuredGrid> grid;
  mutable vtkSmartPointer<vtkStaticCellLocator> locator;  // built on the first sample()
  vtkDataArray* temperature = nullptr;
  vtkDataArray* flux = nullptr;
  vtkDataArray* region = nullptr;
  std::map<int, std::string> region_names;
};

namespace {

// Among the nodes within a relative 1e-9 of the extreme, the one nearest `centre`.
vtkIdType extreme_node(vtkUnstructuredGrid& grid, vtkDataArray& t, double extreme, double span, const Point3& centre) {
  vtkIdType best = 0;
  double best_distance = INFINITY;
  const double tolerance = 1e-9 * std::max(span, std::abs(extreme));
  for (vtkIdType i = 0; i < grid.GetNumberOfPoints(); ++i) {
    if (std::abs(t.GetComponent(i, 0) - extreme) > tolerance) continue;
    double x[3];
    grid.GetPoint(i, x);
    const double d = std::pow(x[0] - centre[0], 2) + std::pow(x[1] - centre[1], 2) + std::pow(x[2] - centre[2], 2);
    if (d < best_distance) best_distance = d, best = i;
  }
  return best;
}

Point3 point_of(vtkUnstructuredGrid& grid, vtkIdType i) {
  double x[3];
  grid.GetPoint(i, x);
  return {x[0], x[1], x[2]};
}

}  // namespace

FieldGrid::FieldGrid(const std::filesystem::path& vtu) : impl_(std::make_unique<Impl>()) {
  if (!std::filesystem::is_regular_file(vtu))
    throw InputError(vtu.string() + ": no such file; the results folder is incomplete: run the case again");
  auto reader = vtkSmartPointer<vtkXMLUnstructuredGridReader>::New();
  reader->SetFileName(vtu.c_str());
  reader->Update();
  impl_->grid = reader->GetOutput();
  if (!impl_->grid || impl_->grid->GetNumberOfPoints() == 0 || impl_->grid->GetNumberOfCells() == 0)
    throw InputError(vtu.string() + ": VTK read no mesh from it; the file is damaged or not a VTK unstructured "
                                    "grid: run the case again");
  Impl& m = *impl_;
  m.temperature = m.grid->GetPointData()->GetArray("temperature");
  if (!m.temperature)
    throw InputError(vtu.string() + ": has no point field 'temperature' (a mesh.vtu from hearth mesh has none); "
                                    "give the folder of a hearth run");
  m.flux = m.grid->GetPointData()->GetArray("heat_flux");
  if (m.flux && m.flux->GetNumberOfComponents() != 3) m.flux = nullptr;
  has_flux_ = m.flux != nullptr;
  m.region = m.grid->GetCellData()->GetArray("region");
  auto* names = vtkStringArray::SafeDownCast(m.grid->GetFieldData()->GetAbstractArray("region_names"));
  vtkDataArray* tags = m.grid->GetFieldData()->GetArray("region_tags");
  if (names && tags)
    for (vtkIdType i = 0; i < std::min<vtkIdType>(names->GetNumberOfValues(), tags->GetNumberOfTuples()); ++i)
      m.region_names[static_cast<int>(tags->GetComponent(i, 0))] = names->GetValue(i);

  double range[2];
  m.temperature->GetRange(range, 0);
  t_min_ = range[0];
  t_max_ = range[1];
  const auto b = bounds();
  const Point3 centre{(b[0] + b[1]) / 2, (b[2] + b[3]) / 2, (b[4] + b[5]) / 2};
  const vtkIdType hottest = extreme_node(*m.grid, *m.temperature, t_max_, t_max_ - t_min_, centre);
  hottest_ = point_of(*m.grid, hottest);
  coldest_ = point_of(*m.grid, extreme_node(*m.grid, *m.temperature, t_min_, t_max_ - t_min_, centre));
  if (m.flux) {
    for (int d = 0; d < 3; ++d) flux_at_hottest_[d] = m.flux->GetComponent(hottest, d);
    for (vtkIdType i = 0; i < m.flux->GetNumberOfTuples(); ++i)
      max_flux_ = std::max(max_flux_, std::sqrt(std::pow(m.flux->GetComponent(i, 0), 2) +
                                                std::pow(m.flux->GetComponent(i, 1), 2) +
                                                std::pow(m.flux->GetComponent(i, 2), 2)));
  }

}

FieldGrid::~FieldGrid() = default;
FieldGrid::FieldGrid(FieldGrid&&) noexcept = default;
FieldGrid& FieldGrid::operator=(FieldGrid&&) noexcept = default;

std::optional<FieldSample> FieldGrid::sample(const Point3& x) const {
  const Impl& m = *impl_;
  if (!m.locator) {
    m.locator = vtkSmartPointer<vtkStaticCellLocator>::New();
    m.locator->SetDataSet(m.grid);
    m.locator->BuildLocator();
    m.grid->BuildLinks();  // point -> elements, for the neighbours below
  }
  double point[3] = {x[0], x[1], x[2]}, pcoords[3], weights[32];
  auto cell = vtkSmartPointer<vtkGenericCell>::New();
  const vtkIdType found = m.locator->FindCell(point, 0.0, cell, pcoords, weights);
  if (found < 0) return std::nullopt;
  // VTK's FindCell takes the first element that holds the point within its parametric
  // tolerance, which next to a face can be the neighbour across it: the wrong region,
  // by up to a thousandth of an element. If the point lies outside the element found,
  // take the element around it that the point lies deepest in (largest smallest
  // barycentric coordinate).
  auto depth_of = [](const double* p) { return std::min({1.0 - p[0] - p[1] - p[2], p[0], p[1], p[2]}); };
  vtkIdType best = found;
  double best_depth = depth_of(pcoords), best_weights[32];
  std::vector<vtkIdType> best_points(cell->GetPointIds()->GetPointer(0),
                                     cell->GetPointIds()->GetPointer(0) + cell->GetNumberOfPoints());
  std::copy(weights, weights + cell->GetNumberOfPoints(), best_weights);
  if (best_depth < 0) {
    std::vector<vtkIdType> around;
    auto cells = vtkSmartPointer<vtkIdList>::New();
    for (vtkIdType p : std::vector<vtkIdType>(best_points)) {
      m.grid->GetPointCells(p, cells);
      for (vtkIdType k = 0; k < cells->GetNumberOfIds(); ++k) around.push_back(cells->GetId(k));
    }
    std::sort(around.begin(), around.end());
    around.erase(std::unique(around.begin(), around.end()), around.end());
    double closest[3], distance2 = 0;
    for (vtkIdType c : around) {
      if (c == found) continue;
      m.grid->GetCell(c, cell);
      int sub_id = 0;
      if (cell->EvaluatePosition(point, closest, sub_id, pcoords, distance2, weights) < 0) continue;
      const double depth = depth_of(pcoords);
      if (depth <= best_depth) continue;
      best = c;
      best_depth = depth;
      best_points.assign(cell->GetPointIds()->GetPointer(0),
                         cell->GetPointIds()->GetPointer(0) + cell->GetNumberOfPoints());
      std::copy(weights, weights + cell->GetNumberOfPoints(), best_weights);
    }
  }
  FieldSample s;
  for (std::size_t k = 0; k < best_points.size(); ++k) {
    const vtkIdType p = best_points[k];
    s.temperature += best_weights[k] * m.temperature->GetComponent(p, 0);
    if (m.flux)
      for (int d = 0; d < 3; ++d) s.heat_flux[d] += best_weights[k] * m.flux->GetComponent(p, d);
  }
  if (m.region) s.region = region_name(static_cast<int>(m.region->GetComponent(best, 0)));
  return s;
}

std::array<double, 6> FieldGrid::bounds() const {
  std::array<double, 6> b{};
  impl_->grid->GetBounds(b.data());
  return b;
}

std::size_t FieldGrid::n_points() const { return static_cast<std::size_t>(impl_->grid->GetNumberOfPoints()); }
std::size_t FieldGrid::n_cells() const { return static_cast<std::size_t>(impl_->grid->GetNumberOfCells()); }

std::string FieldGrid::region_name(int tag) const {
  const auto it = impl_->region_names.find(tag);
  return it != impl_->region_names.end() ? it->second : "region " + std::to_string(tag);
}

vtkUnstructuredGrid& FieldGrid::grid() const { return *impl_->grid; }

}  // namespace hearth
