// MeshError: the geometry or mesh cannot be used (a user-input problem, exit status 1).
#pragma once

#include <stdexcept>
#include <string>

namespace hearth {

class MeshError : public std::runtime_error {
 public:
  explicit MeshError(const std::string& message) : std::runtime_error(message) {}
};

}  // namespace hearth
