// Writes the libFuzzer dictionary for fuzz_case_file: every key, choice and value form
// Expected behaviour, not results: the reader or guard returns, or refuses with a named place (common practice, no source).
// of the case-file schema (io/case_schema), the material library's entries, the
// geometry file names the fuzzer's case folder holds, and the YAML tokens a case file
// is made of. yaml-cpp is a Debian library without coverage instrumentation, so the
// fuzzer cannot discover its syntax on its own: the dictionary hands it the pieces.
//
// Usage: write_case_dictionary OUTPUT.dict
#include <fstream>
#include <iostream>
#include <set>
#include <string>

#include "io/case_schema.hpp"
#include "io/material_library.hpp"
#include "tests/fuzz/case_reader_contract.hpp"

namespace {

// libFuzzer's dictionary syntax: "text" with \\, \" and \xNN escapes.
std::string quoted(const std::string& text) {
  std::string out = "\"";
  for (const unsigned char c : text) {
    if (c == '"' || c == '\\') {
      out += '\\';
      out += static_cast<char>(c);
    } else if (c < 0x20 || c >= 0x7f) {
      const char* hex = "0123456789ABCDEF";
      out += "\\x";
      out += hex[c >> 4];
      out += hex[c & 0xf];
    } else {
      out += static_cast<char>(c);
    }
  }
  return out + "\"";
}

}  // namespace

int main(int argc, char** argv) {
  if (argc != 2) {
    std::cerr << "usage: write_case_dictionary OUTPUT.dict\n";
    return 1;
  }
  std::set<std::string> words;
  for (const hearth::KeySpec& spec : hearth::case_schema()) {
    const std::string name = hearth::last_key_part(spec.key);
    if (name != "*") {
      words.insert(name);
      words.insert(name + ": ");
    }
    for (const std::string& choice : hearth::split_choices(spec.choices)) words.insert(choice);
    for (const std::string& form : hearth::split_choices(spec.forms)) words.insert(form + ": ");
    if (spec.not_yet != "*")
      for (const std::string& form : hearth::split_choices(spec.not_yet)) words.insert(form + ": ");
    if (!spec.default_value.empty()) words.insert(spec.default_value);
  }
  // Entry names the command-line tests use, and the material library's entries.
  for (const char* name : {"wall", "hot", "cold", "sides", "brick", "steel"}) words.insert(name);
  for (const std::string& name : hearth::load_material_library().names()) words.insert(name);
  for (const std::string& file : hearth::fuzz::CaseFolder::geometry_names()) words.insert(file);
  // YAML structure, scalars yaml-cpp treats specially, and numbers at the edges of the
  // ranges the reader checks.
  for (const char* token : {"\n", "\n  ", "\n    ", "\n- ", ": ", ", ", "{", "}", "[", "]", "[[", "]]", "- ", "? ",
                            "---\n", "...\n", "# ", "&a ", "*a", "<<: ", "!!str ", "!!float ", "!!map ", "!!seq ",
                            "!tag ", "|\n", ">\n", "'", "\"", "~", "null", "true", "false", "yes", "no", ".inf",
                            "-.inf", ".nan", "0", "-0", "1", "-1", "0.5", "1e-300", "1e308", "1e309", "-273.15",
                            "-273.16", "273.15", "0x10", "2147483648", "9223372036854775808", "\t", "\\u0000",
                            "#--set ", "=", "."})
    words.insert(token);

  std::ofstream out(argv[1]);
  out << "# Written by write_case_dictionary from the case-file schema; do not edit.\n";
  for (const std::string& word : words) out << quoted(word) << "\n";
  if (!out) {
    std::cerr << "write_case_dictionary: cannot write " << argv[1] << "\n";
    return 1;
  }
  return 0;
}
