// The case reader's contract on arbitrary bytes, shared by the libFuzzer target
// (fuzz_case_file.cpp) and the replay of the inputs it found (tests/io).
//
// Whatever bytes it is given, read_case_text must either return a Case whose values
// lie in the ranges io/case.hpp promises, or throw InputError with a message that says
// where (the case file's name or the --set that caused it). Any other exception, a
// crash or a sanitiser report is a bug in the reader.
#pragma once

#include <filesystem>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace hearth::fuzz {

// The reader broke its contract; what() says how.
class ContractViolation : public std::logic_error {
 public:
  explicit ContractViolation(const std::string& what) : std::logic_error(what) {}
};

// A fuzz input split into --set overrides and the case text. Leading lines of the form
// "#--set KEY=VALUE" are overrides (they stay in the text too, where YAML reads them as
// comments), so one input exercises both the overrides and the file.
struct CaseInput {
  std::vector<std::string> overrides;
  std::string_view text;
};
CaseInput split_case_input(std::string_view bytes);

// A temporary case folder holding an empty placeholder for each geometry file name the
// seed corpus and the dictionary use, so that inputs get past the geometry.file check
// into the rest of the reader. Removed with the object.
class CaseFolder {
 public:
  CaseFolder();
  ~CaseFolder();
  CaseFolder(const CaseFolder&) = delete;
  CaseFolder& operator=(const CaseFolder&) = delete;

  // The path the case text is read as (it is never written).
  std::filesystem::path case_path() const { return directory_ / "case.yaml"; }
  // The placeholder file names.
  static const std::vector<std::string>& geometry_names();

 private:
  std::filesystem::path directory_;
};

enum class CaseVerdict { accepted, refused };

// Reads `bytes` as a case in `folder`; returns whether it was accepted or refused with
// an InputError. Throws ContractViolation for an accepted Case with a value out of its
// range or a refusal whose message does not say where. Any other exception escapes
// untouched: uncaught in the fuzzer, it aborts at the throw with its stack.
CaseVerdict read_case_under_contract(std::string_view bytes, const CaseFolder& folder);

}  // namespace hearth::fuzz
