// Place::str: where a key sits, as the prefix of an input-error message.
#include "io/case.hpp"

namespace hearth {

std::string Place::str() const {
  if (!set_by.empty()) return "--set " + set_by;
  std::string where = file;
  if (line > 0) where += ":" + std::to_string(line);
  if (key.empty()) return where;
  return where.empty() ? key : where + ": " + key;
}

}  // namespace hearth
