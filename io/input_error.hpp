// InputError: the case file or command line is wrong (exit status 1). The message
// already says where (file:line: key), what, and how to fix it.
#pragma once

#include <stdexcept>
#include <string>

namespace hearth {

class InputError : public std::runtime_error {
 public:
  explicit InputError(const std::string& message) : std::runtime_error(message) {}
};

}  // namespace hearth
