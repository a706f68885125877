// The geometry guard: before a Gmsh geometry script from someone else is handed to
// Gmsh, find every construct in it (and in every file it includes or merges) that
// would run a program or write, rename or delete files. Pure text scanning of the
// script, by the lexing rules of Gmsh 4.8 (mesh/gmsh_script_lexer.hpp); no Gmsh calls.
//
// The constructs refused, whatever their arguments (docs/errors.md lists them):
// - commands that run programs: SystemCall, System, NonBlockingSystemCall, OnelabRun,
//   SendToServer;
// - commands that write or remove files: Save, Print, CreateDir, and DeleteFile and
//   RenameFile in case a later Gmsh has them; Printf, Sprintf, Warning and Error sent to
//   a file with > or >>; Plugin (several of Gmsh's plugins write files);
// - options that name programs or files Gmsh would start or write: every Solver option,
//   and options whose name ends in FileName or Command or starts with RecentFile, and
//   TextEditor, WebBrowser and WatchFilePattern;
// - Include and Merge whose file name is not one plain string literal (it would be
//   built when the script runs), a Merge of a compressed archive (.gz, .zip: Gmsh
//   unpacks it through a shell command or writes the unpacked files) or of a program
//   (.py, .exe), and files that include themselves;
// - text that Gmsh 4.8 reads differently from its own lexer, and which could hide a
//   command from a scan: a string holding EndIf, Else, // or /* (Gmsh skips the
//   inactive branch of an If without seeing string quotes), a name in which EndIf,
//   Else, EndFor or Return follows a digit (the skipping stops inside the name), a
//   string longer than 1023 characters (Gmsh cuts it and reads on as commands) and NUL
//   bytes (Gmsh takes them for the end of a string or comment).
#pragma once

#include <filesystem>
#include <string>
#include <string_view>
#include <vector>

namespace hearth {

struct UnsafeConstruct {
  std::string file;
  int line = 0;
  std::string construct;  // what was found, e.g. "SystemCall" or "Printf > file"
  std::string reason;     // why it is refused, e.g. "runs a shell command"
};

// Scans one script's text; no file access. Include/Merge file names found are returned
// in `includes` (literal names only, as written, in the order found).
std::vector<UnsafeConstruct> find_unsafe_constructs(std::string_view text, const std::string& file_name,
                                                    std::vector<std::string>* includes = nullptr);

// A script with everything it includes or merges, scanned.
struct GeometryScan {
  // The script first, then every file it includes or merges (directly or through other
  // files) that exists, each once, as absolute normalised paths.
  std::vector<std::filesystem::path> files;
  std::vector<UnsafeConstruct> unsafe;
};

// Reads `script` and, recursively, every file it Includes or Merges: names relative to
// the folder of the file that names them, as Gmsh resolves them. Included files are
// scanned as scripts whatever their names (Gmsh parses them so); merged files too,
// unless they are CAD or mesh data by their extension or first line. Files that do not
// exist are skipped (Gmsh reports them).
GeometryScan scan_geometry_script(const std::filesystem::path& script);

// Throws MeshError listing every unsafe construct of `scan`, each as file:line, and
// saying to pass --trust-geometry if the script is trusted. Nothing if there is none.
void refuse_unsafe_geometry(const GeometryScan& scan);

}  // namespace hearth
