// Tokens of a Gmsh script, by the rules of Gmsh 4.8's flex scanner.
#include "mesh/gmsh_script_lexer.hpp"

namespace hearth {
namespace {

bool is_identifier_start(char c) { return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '_'; }
bool is_digit(char c) { return c >= '0' && c <= '9'; }
bool is_identifier_char(char c) { return is_identifier_start(c) || is_digit(c); }

// Length of the number starting at `at` ({digit}+, {digit}+"."{digit}*, {digit}*"."{digit}+,
// each with an optional exponent [Ee][-+]?{digit}+), or 0 if none starts there.
std::size_t number_length(std::string_view text, std::size_t at) {
  std::size_t end = at;
  while (end < text.size() && is_digit(text[end])) ++end;
  const bool integer_part = end > at;
  if (end < text.size() && text[end] == '.') {
    std::size_t fraction = end + 1;
    while (fraction < text.size() && is_digit(text[fraction])) ++fraction;
    if (integer_part || fraction > end + 1) end = fraction;  // "." alone is a symbol
  }
  if (end == at) return 0;
  if (end < text.size() && (text[end] == 'e' || text[end] == 'E')) {
    std::size_t exponent = end + 1;
    if (exponent < text.size() && (text[exponent] == '+' || text[exponent] == '-')) ++exponent;
    const std::size_t digits = exponent;
    while (exponent < text.size() && is_digit(text[exponent])) ++exponent;
    if (exponent > digits) end = exponent;  // "3e" is the number 3 and the name "e..."
  }
  return end - at;
}

}  // namespace

std::vector<ScriptToken> lex_gmsh_script(std::string_view text) {
  static const char* const operators[] = {"...", ">>", ">=", "<=", "<<", "==", "!=", "&&", "||",
                                          "++",  "--", "+=", "-=", "*=", "/=", "::"};
  std::vector<ScriptToken> tokens;
  int line = 1;
  std::size_t i = 0;
  auto advance_to = [&](std::size_t end) {  // moves i to end, counting lines
    for (; i < end; ++i)
      if (text[i] == '\n') ++line;
  };
  while (i < text.size()) {
    const char c = text[i];
    if (c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\f') {
      advance_to(i + 1);
      continue;
    }
    if (c == '/' && i + 1 < text.size() && text[i + 1] == '/') {
      const std::size_t end = text.find('\n', i);
      advance_to(end == std::string_view::npos ? text.size() : end);
      continue;
    }
    if (c == '/' && i + 1 < text.size() && text[i + 1] == '*') {
      const std::size_t end = text.find("*/", i + 2);
      advance_to(end == std::string_view::npos ? text.size() : end + 2);
      continue;
    }
    ScriptToken token;
    token.line = line;
    if (c == '"' || c == '\'') {
      const std::size_t end = text.find(c, i + 1);
      const std::size_t stop = end == std::string_view::npos ? text.size() : end;
      token.kind = ScriptTokenKind::string;
      token.text = std::string(text.substr(i + 1, stop - i - 1));
      advance_to(end == std::string_view::npos ? text.size() : end + 1);
      tokens.push_back(std::move(token));
      continue;
    }
    if (is_identifier_start(c)) {
      std::size_t end = i + 1;
      while (end < text.size() && is_identifier_char(text[end])) ++end;
      token.kind = ScriptTokenKind::identifier;
      token.text = std::string(text.substr(i, end - i));
      advance_to(end);
      tokens.push_back(std::move(token));
      continue;
    }
    if (const std::size_t length = number_length(text, i)) {
      token.kind = ScriptTokenKind::number;
      token.text = std::string(text.substr(i, length));
      advance_to(i + length);
      tokens.push_back(std::move(token));
      continue;
    }
    token.kind = ScriptTokenKind::symbol;
    token.text = std::string(1, c);
    for (const char* op : operators)
      if (text.substr(i, std::char_traits<char>::length(op)) == op) {
        token.text = op;
        break;
      }
    advance_to(i + token.text.size());
    tokens.push_back(std::move(token));
  }
  return tokens;
}

}  // namespace hearth
