// CsrMatrix: compressed sparse rows, full (both triangles) storage of a square matrix.
#pragma once

#include <cstdint>
#include <vector>

namespace hearth {

// Row i holds columns col[row_ptr[i] .. row_ptr[i+1]) in increasing order, with
// values in val at the same positions. Symmetric matrices store both triangles.
struct CsrMatrix {
  std::int32_t n = 0;
  std::vector<std::int64_t> row_ptr;  // n + 1 entries
  std::vector<std::int32_t> col;
  std::vector<double> val;

  std::int64_t nnz() const { return row_ptr.empty() ? 0 : row_ptr.back(); }
  // y = A x
  void multiply(const std::vector<double>& x, std::vector<double>& y) const;
};

}  // namespace hearth
