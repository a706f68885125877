// Edit distance between words and the nearest-word suggestion for misspelt keys.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

namespace hearth {

// Optimal-string-alignment distance (Levenshtein plus adjacent transpositions), case
// insensitive for ASCII letters: the fewest single-character insertions, deletions,
// substitutions or swaps of neighbours that turn `a` into `b`.
std::size_t edit_distance(const std::string& a, const std::string& b);

// The candidate closest to `word`, if it is close enough to be a plausible misspelling
// (distance at most max(2, (length + 2) / 3) and less than the word's length). Ties go
// to the earlier candidate.
std::optional<std::string> nearest_word(const std::string& word,
                                        const std::vector<std::string>& candidates);

}  // namespace hearth
