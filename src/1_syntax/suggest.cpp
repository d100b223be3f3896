// Edit distance and the "did you mean" hint built on it.
#include "1_syntax/suggest.h"

#include <algorithm>
#include <vector>

#include <fmt/format.h>

#include "1_syntax/text.h"

namespace rungs::syntax {

int edit_distance(std::string_view a, std::string_view b) {
  // Optimal string alignment: Levenshtein plus transposition of neighbours, the commonest
  // typing slip ("lien" for "line").
  const std::size_t n = a.size(), m = b.size();
  std::vector<std::vector<int>> d(n + 1, std::vector<int>(m + 1));
  for (std::size_t i = 0; i <= n; ++i) d[i][0] = static_cast<int>(i);
  for (std::size_t j = 0; j <= m; ++j) d[0][j] = static_cast<int>(j);
  for (std::size_t i = 1; i <= n; ++i) {
    for (std::size_t j = 1; j <= m; ++j) {
      const int cost = fold_case(a[i - 1]) == fold_case(b[j - 1]) ? 0 : 1;
      d[i][j] = std::min({d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost});
      if (i > 1 && j > 1 && fold_case(a[i - 1]) == fold_case(b[j - 2]) &&
          fold_case(a[i - 2]) == fold_case(b[j - 1]))
        d[i][j] = std::min(d[i][j], d[i - 2][j - 2] + 1);
    }
  }
  return d[n][m];
}

std::string nearest(std::string_view word, std::span<const std::string_view> candidates) {
  std::string_view best;
  int best_distance = 3;
  for (std::string_view candidate : candidates) {
    const int d = edit_distance(word, candidate);
    if (d < best_distance) {
      best = candidate;
      best_distance = d;
    }
  }
  if (best.empty() || 2 * best_distance >= static_cast<int>(std::max(word.size(), best.size())))
    return {};
  return std::string(best);
}

std::string did_you_mean(std::string_view word, std::span<const std::string_view> candidates) {
  const std::string near = nearest(word, candidates);
  if (!near.empty()) return fmt::format("; did you mean '{}'?", near);
  return fmt::format("; expected one of {}", fmt::join(candidates, ", "));
}

}  // namespace rungs::syntax
