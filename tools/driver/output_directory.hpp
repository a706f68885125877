// A run writes into a staging folder beside the output directory, then swaps it in,
// so the directory is never a mix of two runs.
#pragma once

#include <filesystem>
#include <functional>
#include <string>
#include <vector>

namespace hearth {

// Resolves `requested` (absolute, symbolic links followed as far as the path exists)
// and checks it before anything is computed; throws InputError, naming `source` ("--out"
// or "case.yaml:17: output.directory"), when:
// - it is the root folder, or a folder that holds any of `inputs` (the case file, its
//   geometry and the files the geometry includes): replacing it would delete them;
// - it, or a folder on the way to it, exists and is not a folder;
// - it exists, is not empty and holds no hearth result (summary.json, run.json,
//   mesh.json or study.json): replacing it would delete files hearth did not write;
// - the nearest folder of it that exists cannot take a new file (tried with a scratch
//   file, removed at once).
std::filesystem::path checked_output_directory(const std::filesystem::path& requested, const std::string& source,
                                               const std::vector<std::filesystem::path>& inputs);

class StagedDirectory {
 public:
  // Creates `final_path`.partial-<pid>; throws WriteError if the parent is not writable.
  explicit StagedDirectory(std::filesystem::path final_path);
  ~StagedDirectory();  // removes the staging folder unless committed
  StagedDirectory(const StagedDirectory&) = delete;
  StagedDirectory& operator=(const StagedDirectory&) = delete;

  const std::filesystem::path& path() const { return staging_; }
  const std::filesystem::path& final_path() const { return final_; }
  // Calls write(path()). A WriteError from it (disk full, no permission) is thrown on
  // with the note that final_path was left as it was.
  void fill(const std::function<void(const std::filesystem::path&)>& write);
  // Replaces final_path as a whole with the staged folder; WriteError, with final_path
  // as it was, if the renames fail.
  void commit();

 private:
  std::filesystem::path final_, staging_;
  bool committed_ = false;
};

}  // namespace hearth
