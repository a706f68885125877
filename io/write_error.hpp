// WriteError: a result file or folder could not be written (disk full, no permission,
// a read-only file system). The message names the file and the system's reason; the
// program exits 1, and earlier results are left as they were (io/atomic_file.hpp).
#pragma once

#include <stdexcept>
#include <string>

namespace hearth {

class WriteError : public std::runtime_error {
 public:
  explicit WriteError(const std::string& message) : std::runtime_error(message) {}
};

}  // namespace hearth
