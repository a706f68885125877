// A run writes into a staging folder beside the output directory, then swaps it in,
// so the directory is never a mix of two runs.
#pragma once

#include <filesystem>

namespace hearth {

class StagedDirectory {
 public:
  // Creates `final_path`.partial-<pid>; throws InputError if the parent is not writable.
  explicit StagedDirectory(std::filesystem::path final_path);
  ~StagedDirectory();  // removes the staging folder unless committed
  StagedDirectory(const StagedDirectory&) = delete;
  StagedDirectory& operator=(const StagedDirectory&) = delete;

  const std::filesystem::path& path() const { return staging_; }
  const std::filesystem::path& final_path() const { return final_; }
  // Replaces final_path as a whole with the staged folder.
  void commit();

 private:
  std::filesystem::path final_, staging_;
  bool committed_ = false;
};

}  // namespace hearth
