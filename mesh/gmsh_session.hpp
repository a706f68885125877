// GmshSession: the one owner of Gmsh's global state (initialize ... finalize) and its messages.
#pragma once

#include <cstddef>
#include <cstdio>
#include <functional>
#include <mutex>
#include <string>
#include <vector>

namespace hearth {

// While a GmshSession lives, Gmsh is initialised (without reading the user's Gmsh
// configuration files) with terminal output off; Gmsh's warnings and errors are kept
// (its informational messages are not produced: Gmsh 4.8's message log is not safe
// to write from its meshing threads) and forwarded to `progress` by
// forward_messages(). Callers must not raise General.Verbosity. Sessions
// are serialised: a second one in another thread waits for the first to end; a
// second one in the same thread is a programming error (std::logic_error).
// Gmsh's options start from their defaults in every session.
class GmshSession {
 public:
  using Progress = std::function<void(const std::string&)>;

  explicit GmshSession(Progress progress);
  ~GmshSession();
  GmshSession(const GmshSession&) = delete;
  GmshSession& operator=(const GmshSession&) = delete;

  // Sends Gmsh's warnings and errors logged since the last call to `progress`, one
  // line each ("gmsh warning: ...", "gmsh error: ...").
  void forward_messages();

  // Errors Gmsh logged since the session began (without the "Error: " prefix).
  std::vector<std::string> errors() const;

  // Runs `action` (Gmsh calls). Gmsh 4.8 reports an error by throwing a std::string;
  // that or a std::exception becomes a MeshError "<context>: <Gmsh's message>".
  // Messages are forwarded afterwards either way.
  void guarded(const std::string& context, const std::function<void()>& action);

  // Sends one line of our own to `progress` (nothing when it is empty).
  void report(const std::string& line) const;

 private:
  std::vector<std::string> log() const;

  std::unique_lock<std::mutex> lock_;
  Progress progress_;
  std::size_t forwarded_ = 0;  // log lines already looked at by forward_messages()
};

// While it lives, what the process prints to its standard output and error (file
// descriptors 1 and 2) goes to a temporary file instead: OpenCASCADE, under Gmsh,
// prints its STEP reader's and writer's messages there directly. Output of other
// threads in that time is caught too, so keep the scope short (loading a file).
class TerminalCapture {
 public:
  TerminalCapture();
  ~TerminalCapture();  // restores the terminal if finish() was not called
  TerminalCapture(const TerminalCapture&) = delete;
  TerminalCapture& operator=(const TerminalCapture&) = delete;

  // Restores the terminal and returns the non-blank lines printed, terminal escape
  // sequences removed.
  std::vector<std::string> finish();

 private:
  void restore();
  std::FILE* file_ = nullptr;
  int saved_stdout_ = -1;
  int saved_stderr_ = -1;
};

}  // namespace hearth
