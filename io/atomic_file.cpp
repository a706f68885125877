// Temporary name in the same folder, then rename (atomic on POSIX file systems).
#include "io/atomic_file.hpp"

#include <unistd.h>

#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <fstream>

#include "io/write_error.hpp"

namespace hearth {

namespace {

// The test hook of write_atomically: true when writing `path` is to fail.
bool injected_failure(const std::filesystem::path& path) {
  const char* name = std::getenv("HEARTH_TEST_FAIL_WRITE");
  return name && *name && (std::string(name) == "*" || path.filename() == name);
}

}  // namespace

std::string write_failure(const std::filesystem::path& path, int error_number) {
  return "cannot write " + path.string() + ": " + (error_number ? std::strerror(error_number) : "the write failed");
}

void write_atomically(const std::filesystem::path& path,
                      const std::function<void(const std::filesystem::path&)>& write) {
  std::filesystem::path temporary = path;
  temporary += ".partial-" + std::to_string(::getpid());
  try {
    write(temporary);
    if (injected_failure(path))
      throw WriteError(write_failure(path, ENOSPC) + " (injected by HEARTH_TEST_FAIL_WRITE)");
    std::error_code error;
    std::filesystem::rename(temporary, path, error);
    if (error) throw WriteError(write_failure(path, error.value()));
  } catch (...) {
    std::error_code ignored;
    std::filesystem::remove(temporary, ignored);
    throw;
  }
}

void write_text_file(const std::filesystem::path& path, const std::string& text) {
  write_atomically(path, [&](const std::filesystem::path& temporary) {
    errno = 0;
    std::ofstream out(temporary, std::ios::binary);
    if (!out) throw WriteError(write_failure(path, errno));
    out << text;
    out.close();
    if (!out) throw WriteError(write_failure(path, errno));
  });
}

}  // namespace hearth
