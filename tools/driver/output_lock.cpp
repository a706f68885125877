// flock on <parent>/.<name>.lock; the file holds the owner's process id, start time and
// command line for the message a second run gets.
#include "tools/driver/output_lock.hpp"

#include <fcntl.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <ctime>

#include "io/input_error.hpp"

namespace hearth {

namespace fs = std::filesystem;

namespace {

std::string read_all(int fd) {
  std::string text;
  char buffer[512];
  lseek(fd, 0, SEEK_SET);
  for (ssize_t n; (n = read(fd, buffer, sizeof buffer)) > 0 && text.size() < 4096;) text.append(buffer, n);
  while (!text.empty() && (text.back() == '\n' || text.back() == ' ')) text.pop_back();
  return text;
}

std::string now_text() {
  const std::time_t now = std::time(nullptr);
  char text[32];
  std::strftime(text, sizeof text, "%Y-%m-%d %H:%M:%S", std::localtime(&now));
  return text;
}

}  // namespace

OutputLock::OutputLock(const fs::path& output, const std::string& command_line) {
  const fs::path parent = output.parent_path();
  file_ = parent / ("." + output.filename().string() + ".lock");
  for (fs::path p = output; !p.empty() && !fs::exists(p); p = p.parent_path()) created_.insert(created_.begin(), p);
  std::error_code ec;
  fs::create_directories(parent, ec);
  if (ec)
    throw InputError("cannot create the folder " + parent.string() + " for the results: " + ec.message() +
                     "; choose another output folder with --out or output.directory");
  // Retry when the file was removed between open and lock (its last owner finishing):
  // the lock must be on the file that is at the path now.
  for (int attempt = 0; attempt < 20; ++attempt) {
    fd_ = ::open(file_.c_str(), O_RDWR | O_CREAT | O_CLOEXEC, 0644);
    if (fd_ < 0)
      throw InputError("cannot create the lock file " + file_.string() + ": " + std::strerror(errno) +
                       "; choose another output folder with --out or output.directory");
    if (flock(fd_, LOCK_EX | LOCK_NB) != 0) {
      const int error = errno;
      const std::string owner = read_all(fd_);
      ::close(fd_);
      fd_ = -1;
      if (error == EWOULDBLOCK)
        throw InputError("the output folder " + output.string() + " is being written by another hearth (" +
                         (owner.empty() ? "lock file " + file_.string() : owner) +
                         "); wait until it has finished, or choose another folder with --out");
      throw InputError("cannot lock " + file_.string() + ": " + std::strerror(error));
    }
    struct stat held {}, at_path {};
    if (fstat(fd_, &held) == 0 && stat(file_.c_str(), &at_path) == 0 && held.st_ino == at_path.st_ino &&
        held.st_dev == at_path.st_dev)
      break;
    ::close(fd_);
    fd_ = -1;
  }
  if (fd_ < 0) throw InputError("cannot lock " + file_.string() + ": it keeps being replaced by other processes");
  const std::string owner = "process " + std::to_string(::getpid()) + ", started " + now_text() + ": " + command_line;
  if (ftruncate(fd_, 0) == 0) {
    lseek(fd_, 0, SEEK_SET);
    [[maybe_unused]] const ssize_t written = ::write(fd_, owner.data(), owner.size());
  }
}

OutputLock::~OutputLock() {
  if (fd_ >= 0) {
    ::unlink(file_.c_str());  // while still locked: a waiting process then retries on a fresh file
    ::close(fd_);
  }
  for (auto it = created_.rbegin(); it != created_.rend(); ++it) ::rmdir(it->c_str());  // only if empty
}

}  // namespace hearth
