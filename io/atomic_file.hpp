// Writing files so that a crash never leaves a half-written file under the final name.
#pragma once

#include <filesystem>
#include <functional>
#include <string>

namespace hearth {

// Calls write(temporary_path), then renames the temporary file onto `path`. If write
// throws, the temporary file is removed and `path` is left as it was.
void write_atomically(const std::filesystem::path& path,
                      const std::function<void(const std::filesystem::path&)>& write);

// Writes `text` to `path` atomically.
void write_text_file(const std::filesystem::path& path, const std::string& text);

}  // namespace hearth
