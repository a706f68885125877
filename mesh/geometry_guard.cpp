// The geometry guard: unsafe constructs of Gmsh scripts, found by scanning their text.
//
// What Gmsh 4.8.4 does with each construct was checked against the library itself
// (its command words, and scripts run through gmsh::open in a scratch folder): Save,
// Printf > file and CreateDir write; a string holding "EndIf" or "//" inside an inactive
// If branch hides the commands after it from a scan that respects quotes; Merge of a
// .msh file without a mesh header, and Include of any file, parse it as a script.
#include "mesh/geometry_guard.hpp"

#include <algorithm>
#include <cctype>
#include <fstream>
#include <iterator>
#include <set>

#include "mesh/gmsh_script_lexer.hpp"
#include "mesh/mesh_error.hpp"

namespace hearth {
namespace fs = std::filesystem;

namespace {

struct Rule {
  const char* word;
  const char* reason;
};

// Command words of Gmsh's scripting language refused whatever follows them.
constexpr Rule command_rules[] = {
    {"SystemCall", "runs a shell command"},
    {"System", "runs a shell command"},
    {"NonBlockingSystemCall", "runs a shell command"},
    {"OnelabRun", "starts another program (a ONELAB client)"},
    {"SendToServer", "sends data to another program (the ONELAB server)"},
    {"Save", "writes a mesh, model or view file"},
    {"Print", "writes a picture file"},
    {"CreateDir", "creates a folder"},
    {"DeleteFile", "deletes a file"},
    {"RenameFile", "renames a file"},
    {"Plugin", "runs a Gmsh plugin, and several plugins write files (HomologyComputation, Bubbles, NearToFarField, "
               "Microstructure)"},
};

// Words whose output can be sent to a file with > or >>.
constexpr const char* printing_words[] = {"Printf", "Sprintf", "Warning", "Error"};

// Words that read another file; its name must be a plain string literal.
constexpr const char* reading_words[] = {"Include", "Merge", "MergeWithBoundingBox"};

// Option categories (General.xxx, Mesh.xxx, View[0].xxx, ...).
constexpr const char* option_categories[] = {"General", "Geometry", "Mesh", "Solver", "PostProcessing", "View",
                                             "Print"};

// Words at which Gmsh stops skipping an inactive If branch, a loop or a macro body.
constexpr const char* skip_stop_words[] = {"EndIf", "Else", "EndFor", "Return"};

// Merged files Gmsh 4.8 reads with a CAD or mesh reader and never parses as a script
// (checked one by one: a file of each kind holding script text was merged and not run).
constexpr const char* data_extensions[] = {".step", ".stp", ".brep", ".brp", ".iges", ".igs", ".stl",
                                           ".vtk",  ".unv", ".med",  ".mesh", ".bdf", ".nas", ".ply",
                                           ".wrl",  ".p3d", ".png",  ".diff"};

// First lines by which Gmsh 4.8 reads a merged file as a mesh or view, whatever its name.
constexpr const char* data_headers[] = {"$MeshFormat", "$NOD", "$NOE", "$PTS", "$ELM", "$PostFormat", "$View"};

template <class List>
bool listed(const List& list, const std::string& word) {
  return std::any_of(std::begin(list), std::end(list), [&](const char* w) { return word == w; });
}

bool is_letter(char c) { return std::isalpha(static_cast<unsigned char>(c)) || c == '_'; }
bool is_digit(char c) { return std::isdigit(static_cast<unsigned char>(c)) != 0; }

bool is_symbol(const std::vector<ScriptToken>& tokens, std::size_t i, const char* text) {
  return i < tokens.size() && tokens[i].kind == ScriptTokenKind::symbol && tokens[i].text == text;
}

bool ends_with(const std::string& text, const std::string& tail) {
  return text.size() >= tail.size() && text.compare(text.size() - tail.size(), tail.size(), tail) == 0;
}

// Options that name a program Gmsh may start or a file it may write.
bool is_program_or_file_option(const std::string& category, const std::string& name) {
  if (category == "Solver") return true;  // solver executables, remote logins, archived outputs
  return ends_with(name, "FileName") || ends_with(name, "Command") || name.rfind("RecentFile", 0) == 0 ||
         name == "TextEditor" || name == "WebBrowser" || name == "WatchFilePattern";
}

// Index just past the bracketed group that opens at `open` ((...), [...] or {...}), or
// `open` itself if no group opens there.
std::size_t past_group(const std::vector<ScriptToken>& tokens, std::size_t open) {
  if (!(is_symbol(tokens, open, "(") || is_symbol(tokens, open, "[") || is_symbol(tokens, open, "{"))) return open;
  int depth = 0;
  for (std::size_t i = open; i < tokens.size(); ++i) {
    if (tokens[i].kind != ScriptTokenKind::symbol) continue;
    const std::string& t = tokens[i].text;
    if (t == "(" || t == "[" || t == "{") ++depth;
    if ((t == ")" || t == "]" || t == "}") && --depth == 0) return i + 1;
  }
  return tokens.size();
}

// Where `word` occurs in `text` as Gmsh's skipping finds it: not after a letter or '_'
// (digits do not count) and, unless `inside_name`, not before one. Inside a name the
// word must be followed by a digit for the skipping to stop there and read on.
bool has_skip_word(const std::string& text, const std::string& word, bool inside_name) {
  for (std::size_t p = text.find(word); p != std::string::npos; p = text.find(word, p + 1)) {
    if (p > 0 && is_letter(text[p - 1])) continue;
    const std::size_t after = p + word.size();
    if (inside_name ? (after < text.size() && is_digit(text[after])) : (after == text.size() || !is_letter(text[after])))
      return true;
  }
  return false;
}

struct Reference {
  std::string name;
  bool include = true;  // Include (parsed as a script) or Merge (by its kind)
  int line = 0;
};

class Scanner {
 public:
  Scanner(std::string_view text, std::string file) : text_(text), file_(std::move(file)) {}

  std::vector<UnsafeConstruct> run(std::vector<Reference>& references) {
    check_nul_bytes();
    tokens_ = lex_gmsh_script(text_);
    for (std::size_t i = 0; i < tokens_.size(); ++i) {
      const ScriptToken& token = tokens_[i];
      if (token.kind == ScriptTokenKind::string) check_string(token);
      if (token.kind != ScriptTokenKind::identifier) continue;
      check_hidden_stop_word(token);
      check_option(i);
      // A word after '.' or '::' is a member name; one before '.' an option category
      // (Print.Format) or structure: neither is a command.
      if (is_symbol(tokens_, i - 1, ".") || is_symbol(tokens_, i - 1, "::") || is_symbol(tokens_, i + 1, "."))
        continue;
      for (const Rule& rule : command_rules)
        if (token.text == rule.word) flag(token.line, token.text, rule.reason);
      if (listed(printing_words, token.text)) check_redirect(i);
      if (listed(reading_words, token.text)) check_reference(i, references);
    }
    return std::move(found_);
  }

 private:
  void flag(int line, const std::string& construct, const std::string& reason) {
    found_.push_back({file_, line, construct, reason});
  }

  void check_nul_bytes() {
    int line = 1;
    for (char c : text_) {
      if (c == '\n') ++line;
      if (c == '\0') {
        flag(line, "NUL byte", "Gmsh takes it for the end of a string or comment and reads on as commands");
        return;
      }
    }
  }

  void check_string(const ScriptToken& token) {
    const std::string quoted = "string \"" + (token.text.size() > 40 ? token.text.substr(0, 40) + "..." : token.text) + "\"";
    if (token.text.size() >= 1024)
      flag(token.line, "string of " + std::to_string(token.text.size()) + " characters",
           "Gmsh 4.8 cuts strings after 1023 characters and reads the rest as commands");
    for (const char* word : {"EndIf", "Else"})
      if (has_skip_word(token.text, word, false))
        flag(token.line, quoted,
             std::string("holds '") + word +
                 "': Gmsh skips an inactive If branch without seeing string quotes, so it would stop inside this "
                 "string and read the rest as commands");
    for (const char* opener : {"//", "/*"})
      if (token.text.find(opener) != std::string::npos)
        flag(token.line, quoted,
             std::string("holds '") + opener +
                 "': Gmsh skips an inactive If branch without seeing string quotes, so it would take a comment to "
                 "start here and could read commands hidden in a later comment");
  }

  void check_hidden_stop_word(const ScriptToken& token) {
    for (const char* word : skip_stop_words)
      if (has_skip_word(token.text, word, true))
        flag(token.line, "name " + token.text,
             std::string("'") + word +
                 "' followed by a digit inside a name: Gmsh's skipping of inactive If branches, loops and macros "
                 "stops there and reads the rest of the name as commands");
  }

  // General.TmpFileName = ..., Solver.Executable0 = ..., View[0].DoubleClickedCommand = ...
  void check_option(std::size_t i) {
    const ScriptToken& category = tokens_[i];
    if (!listed(option_categories, category.text) || is_symbol(tokens_, i - 1, ".")) return;
    const std::size_t dot = past_group(tokens_, i + 1);
    if (!is_symbol(tokens_, dot, ".") || dot + 1 >= tokens_.size() ||
        tokens_[dot + 1].kind != ScriptTokenKind::identifier)
      return;
    const std::string& name = tokens_[dot + 1].text;
    if (is_program_or_file_option(category.text, name))
      flag(category.line, "option " + category.text + "." + name,
           category.text == "Solver" ? "Solver options name programs that Gmsh starts and the files they write"
                                     : "names a program that Gmsh starts or a file that it writes");
  }

  // Printf("...", x) > "file"; and >> "file";
  void check_redirect(std::size_t i) {
    const std::size_t after = past_group(tokens_, i + 1);
    if (after == i + 1) return;
    if (is_symbol(tokens_, after, ">") || is_symbol(tokens_, after, ">>"))
      flag(tokens_[i].line, tokens_[i].text + " " + tokens_[after].text + " file",
           "writes to a file (" + tokens_[after].text + ")");
  }

  // Include "file.geo"; with one plain string literal, else refused.
  void check_reference(std::size_t i, std::vector<Reference>& references) {
    const ScriptToken& word = tokens_[i];
    const bool literal = i + 1 < tokens_.size() && tokens_[i + 1].kind == ScriptTokenKind::string &&
                         (i + 2 == tokens_.size() || is_symbol(tokens_, i + 2, ";"));
    if (!literal) {
      flag(word.line, word.text + " with a computed file name",
           "the file name is built when the script runs, so it cannot be checked before; write it as one plain "
           "string, e.g. " + word.text + " \"part.geo\";");
      return;
    }
    references.push_back({tokens_[i + 1].text, word.text == "Include", word.line});
  }

  std::string_view text_;
  std::string file_;
  std::vector<ScriptToken> tokens_;
  std::vector<UnsafeConstruct> found_;
};

std::string lower_extension(const fs::path& path) {
  std::string extension = path.extension().string();
  std::transform(extension.begin(), extension.end(), extension.begin(),
                 [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return extension;
}

bool read_file(const fs::path& path, std::string& text) {
  std::error_code error;
  if (!fs::is_regular_file(path, error)) return false;
  std::ifstream in(path, std::ios::binary);
  if (!in) return false;
  text.assign(std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>());
  return true;
}

bool starts_like_data(const std::string& text) {
  return std::any_of(std::begin(data_headers), std::end(data_headers),
                     [&](const char* header) { return text.rfind(header, 0) == 0; });
}

class Walker {
 public:
  GeometryScan run(const fs::path& script) {
    visit(fs::absolute(script).lexically_normal(), true);
    return std::move(scan_);
  }

 private:
  // `as_script`: the file is parsed by Gmsh (the script itself or an Include); else it
  // was merged and is parsed only when it is not CAD or mesh data.
  void visit(const fs::path& file, bool as_script) {
    std::string text;
    if (!read_file(file, text)) return;
    scan_.files.push_back(file);
    if (!as_script && (listed(data_extensions, lower_extension(file)) || starts_like_data(text))) return;
    std::vector<Reference> references;
    for (UnsafeConstruct& u : Scanner(text, file.string()).run(references)) scan_.unsafe.push_back(std::move(u));
    chain_.push_back(file);
    for (const Reference& reference : references) follow(file, reference);
    chain_.pop_back();
  }

  void follow(const fs::path& from, const Reference& reference) {
    const fs::path named(reference.name);
    const fs::path target = (named.is_absolute() ? named : from.parent_path() / named).lexically_normal();
    const std::string word = reference.include ? "Include" : "Merge";
    const std::string extension = lower_extension(target);
    if (!reference.include && (extension == ".gz" || extension == ".zip")) {
      refuse(from, reference.line, "Merge of a " + extension + " file",
             "Gmsh unpacks compressed files through a shell command (after asking on the terminal) or writes the "
             "unpacked files; unpack it yourself and merge the unpacked file");
      return;
    }
    if (!reference.include && (extension == ".py" || extension == ".exe")) {
      refuse(from, reference.line, "Merge of a " + extension + " file", "Gmsh treats such a file as a program to run");
      return;
    }
    if (std::find(chain_.begin(), chain_.end(), target) != chain_.end()) {
      refuse(from, reference.line, word + " \"" + reference.name + "\"",
             "the file includes itself (through the files that include it), which Gmsh repeats without end");
      return;
    }
    if (std::find(scan_.files.begin(), scan_.files.end(), target) != scan_.files.end()) return;  // scanned already
    visit(target, reference.include);
  }

  void refuse(const fs::path& file, int line, const std::string& construct, const std::string& reason) {
    scan_.unsafe.push_back({file.string(), line, construct, reason});
  }

  GeometryScan scan_;
  std::vector<fs::path> chain_;  // the files being scanned, outermost first
};

}  // namespace

std::vector<UnsafeConstruct> find_unsafe_constructs(std::string_view text, const std::string& file_name,
                                                    std::vector<std::string>* includes) {
  std::vector<Reference> references;
  std::vector<UnsafeConstruct> found = Scanner(text, file_name).run(references);
  if (includes)
    for (const Reference& reference : references) includes->push_back(reference.name);
  return found;
}

GeometryScan scan_geometry_script(const fs::path& script) { return Walker().run(script); }

void refuse_unsafe_geometry(const GeometryScan& scan) {
  if (scan.unsafe.empty()) return;
  constexpr std::size_t shown = 20;
  std::string message = "the geometry script " + (scan.files.empty() ? std::string("") : scan.files.front().string()) +
                        " has " + std::to_string(scan.unsafe.size()) +
                        (scan.unsafe.size() == 1 ? " construct" : " constructs") +
                        " that could run a program or write files, so hearth does not hand it to Gmsh:";
  for (std::size_t k = 0; k < scan.unsafe.size() && k < shown; ++k) {
    const UnsafeConstruct& u = scan.unsafe[k];
    message += "\n  " + u.file + ":" + std::to_string(u.line) + ": " + u.construct + ": " + u.reason;
  }
  if (scan.unsafe.size() > shown) message += "\n  ... and " + std::to_string(scan.unsafe.size() - shown) + " more";
  message += "\nremove them; or, if you trust the script (you wrote it, or know what it does), run again with "
             "--trust-geometry";
  throw MeshError(message);
}

}  // namespace hearth
