// Temporary name in the same folder, then rename (atomic on POSIX file systems).
#include "io/atomic_file.hpp"

#include <fstream>
#include <stdexcept>
#include <unistd.h>

namespace hearth {

void write_atomically(const std::filesystem::path& path,
                      const std::function<void(const std::filesystem::path&)>& write) {
  std::filesystem::path temporary = path;
  temporary += ".partial-" + std::to_string(::getpid());
  try {
    write(temporary);
    std::filesystem::rename(temporary, path);
  } catch (...) {
    std::error_code ignored;
    std::filesystem::remove(temporary, ignored);
    throw;
  }
}

void write_text_file(const std::filesystem::path& path, const std::string& text) {
  write_atomically(path, [&](const std::filesystem::path& temporary) {
    std::ofstream out(temporary, std::ios::binary);
    out << text;
    out.close();
    if (!out) throw std::runtime_error("cannot write " + temporary.string());
  });
}

}  // namespace hearth
