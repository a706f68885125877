// The levels of a study run as child processes of this program (`hearth run ...`), one
// or several at a time: each level has its own process, so nothing a level's mesher or
// solver holds (Gmsh's global state, MPI, threads) is shared with another, and a
// parallel study computes exactly what a serial one does.
#pragma once

#include <filesystem>
#include <functional>
#include <string>
#include <vector>

namespace hearth {

struct LevelRun {
  std::string label;                   // "level 2", "order 2, level 1": for messages
  std::vector<std::string> arguments;  // after the program name, e.g. {"run", "case.yaml", "--out", ...}
};

// What a level is estimated to need: bytes, or NaN while it cannot be estimated yet
// (it then waits for an earlier level to finish; with none left running it starts
// anyway); `basis` says what the figure rests on, e.g. "some 120000 nodes".
struct MemoryNeed {
  double bytes = 0.0;
  std::string basis;
};

struct LevelScheduling {
  int jobs = 1;  // at most this many levels at once
  std::function<MemoryNeed(std::size_t index)> memory_needed;  // may be empty: no limit
  // Called in the order levels finish, with the wall time of each, before any later
  // level's memory_needed is asked again.
  std::function<void(std::size_t index, double seconds)> finished;
};

// Runs every level, in order of index when one starts, at most `jobs` at once and only
// as many as fit in 90 % of the memory available when this is called (MemAvailable of
// /proc/meminfo; no limit when unknown). A level that would not fit alone is an
// InputError with the figures; a level that fails stops the rest from starting and,
// once the running ones are done, is reported with the status it exited with
// (InputError for 1, SolveFailed for 2, Interrupted for 130/143, std::runtime_error
// otherwise) and its own message. SIGINT/SIGTERM are passed on to the running levels.
void run_levels(const std::vector<LevelRun>& levels, const LevelScheduling& scheduling);

// Available memory (MemAvailable of /proc/meminfo) in bytes; 0 when unknown.
double available_memory();

}  // namespace hearth
