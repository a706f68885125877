// Staging folder, then rename: old results are moved aside and removed only after
// the new ones are in place.
#include "tools/driver/output_directory.hpp"

#include <unistd.h>

#include "io/input_error.hpp"

namespace hearth {

namespace fs = std::filesystem;

StagedDirectory::StagedDirectory(fs::path final_path) : final_(std::move(final_path)) {
  final_ = fs::absolute(final_).lexically_normal();
  if (final_.filename().empty()) final_ = final_.parent_path();
  staging_ = final_;
  staging_ += ".partial-" + std::to_string(::getpid());
  std::error_code ec;
  fs::create_directories(final_.parent_path(), ec);
  if (ec) throw InputError("cannot create the output folder " + final_.parent_path().string() + ": " + ec.message() +
                           "; choose another with --out or output.directory");
  fs::remove_all(staging_, ec);
  fs::create_directory(staging_, ec);
  if (ec) throw InputError("cannot write in " + final_.parent_path().string() + ": " + ec.message() +
                           "; choose another output folder with --out or output.directory");
}

StagedDirectory::~StagedDirectory() {
  if (committed_) return;
  std::error_code ec;
  fs::remove_all(staging_, ec);
}

void StagedDirectory::commit() {
  fs::path old = final_;
  old += ".old-" + std::to_string(::getpid());
  const bool had_old = fs::exists(final_);
  if (had_old) fs::rename(final_, old);
  fs::rename(staging_, final_);
  committed_ = true;
  if (had_old) {
    std::error_code ec;
    fs::remove_all(old, ec);
  }
}

}  // namespace hearth
