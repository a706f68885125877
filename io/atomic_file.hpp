// Writing files so that a crash never leaves a half-written file under the final name.
#pragma once

#include <filesystem>
#include <functional>
#include <string>

namespace hearth {

// Calls write(temporary_path), then renames the temporary file onto `path`. If write
// throws, the temporary file is removed and `path` is left as it was. Failures to
// write or rename are WriteError (io/write_error.hpp) naming `path` and the reason.
//
// Test hook: with the environment variable HEARTH_TEST_FAIL_WRITE set to a file name
// (e.g. temperature.vtu, or * for every file), writing a file of that name fails after
// its temporary file was written, as when the disk fills up (ENOSPC). The tests of
// write failures use it (tests/cli/test_write_failures.py).
void write_atomically(const std::filesystem::path& path,
                      const std::function<void(const std::filesystem::path&)>& write);

// Writes `text` to `path` atomically.
void write_text_file(const std::filesystem::path& path, const std::string& text);

// "cannot write PATH: REASON" for an errno value (0: "the write failed").
std::string write_failure(const std::filesystem::path& path, int error_number);

}  // namespace hearth
