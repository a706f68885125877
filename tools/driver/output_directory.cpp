// Output folders: checked before a run, then written as a staging folder and renamed:
// old results are moved aside and removed only after the new ones are in place.
#include "tools/driver/output_directory.hpp"

#include <stdlib.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

#include "io/input_error.hpp"
#include "io/write_error.hpp"

namespace hearth {

namespace fs = std::filesystem;

namespace {

// Files a hearth run, mesh or study leaves in its output folder.
constexpr const char* result_markers[] = {"summary.json", "run.json",       "mesh.json", "study.json",
                                          "level_0",      "base_mesh.json", "order_1",   "order_2"};

std::string how_to_choose(const std::string& source) {
  return source == "--out" ? "choose another folder with --out" : "choose another folder (output.directory, or --out)";
}

}  // namespace

fs::path checked_output_directory(const fs::path& requested, const std::string& source,
                                  const std::vector<fs::path>& inputs) {
  std::error_code ec;
  fs::path out = fs::weakly_canonical(fs::absolute(requested), ec);
  if (ec) out = fs::absolute(requested).lexically_normal();
  if (out.filename().empty()) out = out.parent_path();
  const std::string where = source + ": the output folder " + out.string();
  if (out == out.root_path())
    throw InputError(where + " is the root folder; results replace their folder as a whole: " + how_to_choose(source));
  // Swapping the folder in replaces it whole: it must not hold the inputs.
  for (const fs::path& input : inputs) {
    const fs::path resolved = fs::weakly_canonical(fs::absolute(input), ec);
    const auto rel = (ec ? fs::absolute(input) : resolved).lexically_relative(out);
    if (!rel.empty() && *rel.begin() != "..")
      throw InputError(where + " contains the input " + resolved.string() +
                       ", which would be deleted when the results replace the folder; choose a folder of its own "
                       "(e.g. results)");
  }
  // The nearest part of the path that exists must be a folder hearth can write in.
  fs::path existing = out;
  while (!fs::exists(existing, ec) && existing.has_parent_path() && existing != existing.parent_path())
    existing = existing.parent_path();
  if (!fs::is_directory(existing, ec))
    throw InputError(where + ": " + existing.string() + " is a file, not a folder; " + how_to_choose(source));
  if (existing == out) {
    bool empty = true, has_result = false;
    for (const auto& entry : fs::directory_iterator(out, ec)) {
      empty = false;
      for (const char* marker : result_markers)
        if (entry.path().filename() == marker) has_result = true;
    }
    if (!empty && !has_result)
      throw InputError(where + " holds files and none of hearth's results (summary.json, run.json, mesh.json); a run "
                       "replaces its output folder as a whole, which would delete them: " + how_to_choose(source) +
                       " (a new or empty one, or one with earlier results)");
  }
  // Results are written beside the folder and renamed into place: its parent must take
  // a new file. Tried for real (and removed at once): permissions alone do not tell, for
  // root, a read-only or a special file system.
  const fs::path parent = existing == out ? out.parent_path() : existing;
  std::string probe = (parent / ".hearth-write-test-XXXXXX").string();
  const int fd = mkstemp(probe.data());
  if (fd < 0)
    throw InputError(where + " cannot be written: " + parent.string() + ": " + std::strerror(errno) + "; " +
                     how_to_choose(source));
  ::close(fd);
  ::unlink(probe.c_str());
  return out;
}


StagedDirectory::StagedDirectory(fs::path final_path) : final_(std::move(final_path)) {
  final_ = fs::absolute(final_).lexically_normal();
  if (final_.filename().empty()) final_ = final_.parent_path();
  staging_ = final_;
  staging_ += ".partial-" + std::to_string(::getpid());
  std::error_code ec;
  fs::create_directories(final_.parent_path(), ec);
  if (ec) throw WriteError("cannot create the output folder " + final_.parent_path().string() + ": " + ec.message() +
                           "; choose another with --out or output.directory");
  fs::remove_all(staging_, ec);
  fs::create_directory(staging_, ec);
  if (ec) throw WriteError("cannot write in " + final_.parent_path().string() + ": " + ec.message() +
                           "; choose another output folder with --out or output.directory");
}

StagedDirectory::~StagedDirectory() {
  if (committed_) return;
  std::error_code ec;
  fs::remove_all(staging_, ec);
}

void StagedDirectory::fill(const std::function<void(const fs::path&)>& write) {
  try {
    write(staging_);
  } catch (const WriteError& e) {
    std::error_code ec;
    const bool had_results = fs::exists(final_, ec);
    // Name the file by where it was to end up; the staging folder is gone by then.
    std::string what = e.what();
    for (std::size_t at = what.find(staging_.string()); at != std::string::npos; at = what.find(staging_.string()))
      what.replace(at, staging_.string().size(), final_.string());
    throw WriteError(what + "; " +
                     (had_results ? "the earlier results in " + final_.string() + " are unchanged"
                                  : "nothing was written to " + final_.string()) +
                     "; free some space or choose another folder with --out");
  }
}

void StagedDirectory::commit() {
  fs::path old = final_;
  old += ".old-" + std::to_string(::getpid());
  std::error_code ec;
  const bool had_old = fs::exists(final_, ec);
  if (had_old) {
    fs::rename(final_, old, ec);
    if (ec) throw WriteError("cannot replace " + final_.string() + ": " + ec.message() + "; it is unchanged");
  }
  fs::rename(staging_, final_, ec);
  if (ec) {
    std::error_code restored;
    if (had_old) fs::rename(old, final_, restored);
    throw WriteError("cannot put the results in place as " + final_.string() + ": " + ec.message() +
                     (had_old && !restored ? "; the earlier results are unchanged" : ""));
  }
  committed_ = true;
  if (had_old) fs::remove_all(old, ec);
}

}  // namespace hearth
