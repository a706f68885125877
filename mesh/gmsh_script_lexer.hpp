// Splits the text of a Gmsh geometry script into tokens the way Gmsh 4.8's own lexer
// does, so that the geometry guard sees exactly the words Gmsh's parser will see.
// Pure text processing: no file access, no Gmsh calls.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace hearth {

enum class ScriptTokenKind {
  identifier,  // [A-Za-z_][A-Za-z0-9_]*: keywords, command words, variable and option names
  string,      // "..." or '...': text holds the contents without the quotes
  number,      // 12, 1.5, .5, 3e-2
  symbol,      // punctuation and operators: ; . ( ) [ ] { } = > >> >= :: ... and others
};

struct ScriptToken {
  ScriptTokenKind kind = ScriptTokenKind::symbol;
  std::string text;
  int line = 1;  // 1-based line where the token starts
};

// Gmsh 4.8's lexing rules, as its flex scanner has them (Parser/Gmsh.l):
// - blanks are space, tab, \n, \r and \f; lines are counted at \n only;
// - "//" comments run to the next \n, "/*" comments to the next "*/";
// - strings run from a " or ' to the next identical quote, with no escapes, and may
//   span lines;
// - identifiers are [A-Za-z_][A-Za-z0-9_]*, case-sensitive; numbers are digits with an
//   optional fraction and an exponent that has digits;
// - every other byte is a one-character symbol, except the operators >> >= <= << ==
//   != && || ++ -- += -= *= /= :: and ...
// An unterminated string or comment runs to the end of the text.
std::vector<ScriptToken> lex_gmsh_script(std::string_view text);

}  // namespace hearth
