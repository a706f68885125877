// Edit distance (optimal string alignment) and nearest-word suggestion.
#include "io/text_distance.hpp"

#include <algorithm>
#include <cctype>

namespace hearth {

namespace {

char lower(char c) { return static_cast<char>(std::tolower(static_cast<unsigned char>(c))); }

}  // namespace

std::size_t edit_distance(const std::string& a, const std::string& b) {
  const std::size_t n = a.size(), m = b.size();
  // d[i][j]: distance between the first i characters of a and the first j of b,
  // stored row by row in (n + 1) x (m + 1).
  std::vector<std::size_t> d((n + 1) * (m + 1));
  auto at = [m, &d](std::size_t i, std::size_t j) -> std::size_t& { return d[i * (m + 1) + j]; };
  for (std::size_t i = 0; i <= n; ++i) at(i, 0) = i;
  for (std::size_t j = 0; j <= m; ++j) at(0, j) = j;
  for (std::size_t i = 1; i <= n; ++i) {
    for (std::size_t j = 1; j <= m; ++j) {
      const std::size_t cost = lower(a[i - 1]) == lower(b[j - 1]) ? 0 : 1;
      at(i, j) = std::min({at(i - 1, j) + 1, at(i, j - 1) + 1, at(i - 1, j - 1) + cost});
      if (i > 1 && j > 1 && lower(a[i - 1]) == lower(b[j - 2]) &&
          lower(a[i - 2]) == lower(b[j - 1]))
        at(i, j) = std::min(at(i, j), at(i - 2, j - 2) + 1);
    }
  }
  return at(n, m);
}

std::optional<std::string> nearest_word(const std::string& word,
                                        const std::vector<std::string>& candidates) {
  const std::size_t limit = std::max<std::size_t>(2, (word.size() + 2) / 3);
  std::optional<std::string> best;
  std::size_t best_distance = limit + 1;
  for (const std::string& candidate : candidates) {
    const std::size_t distance = edit_distance(word, candidate);
    if (distance < best_distance && distance < std::max(word.size(), std::size_t{1})) {
      best = candidate;
      best_distance = distance;
    }
  }
  return best;
}

}  // namespace hearth
