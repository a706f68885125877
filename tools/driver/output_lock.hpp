// One hearth process at a time per output folder: a lock file beside the folder,
// held with flock(2), so that a second run, mesh or study writing the same folder is
// refused instead of mixing its files with the first one's.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

namespace hearth {

class OutputLock {
 public:
  // Locks `output` (an absolute path, checked by checked_output_directory) through
  // <parent>/.<name>.lock, creating the parent folders if needed. Throws InputError
  // naming the other process when another hearth holds the lock. A lock file left by
  // a killed run holds no lock (the kernel drops a dead process's flock), so it never
  // blocks a later run. `command_line` is written into the file for that message.
  OutputLock(const std::filesystem::path& output, const std::string& command_line);
  // Removes the lock file and releases the lock; the output folder and the parent
  // folders that did not exist before the lock are removed again when they are still
  // empty (a run that wrote nothing leaves nothing).
  ~OutputLock();
  OutputLock(const OutputLock&) = delete;
  OutputLock& operator=(const OutputLock&) = delete;

  const std::filesystem::path& file() const { return file_; }

 private:
  std::filesystem::path file_;
  std::vector<std::filesystem::path> created_;  // folders that did not exist before, innermost last
  int fd_ = -1;
};

}  // namespace hearth
