#include "yaml_messages.hpp"

#include <algorithm>
#include <cctype>

#include <fmt/format.h>

namespace qftplan::yaml_detail {
namespace {

/// Optimal-string-alignment distance (edits: insert, delete, substitute, swap neighbours), ignoring case.
int edit_distance(std::string_view a, std::string_view b) {
  const auto lower = [](char c) { return static_cast<char>(std::tolower(static_cast<unsigned char>(c))); };
  const std::size_t n = a.size(), m = b.size();
  std::vector<std::vector<int>> d(n + 1, std::vector<int>(m + 1, 0));
  for (std::size_t i = 0; i <= n; ++i) d[i][0] = static_cast<int>(i);
  for (std::size_t j = 0; j <= m; ++j) d[0][j] = static_cast<int>(j);
  for (std::size_t i = 1; i <= n; ++i)
    for (std::size_t j = 1; j <= m; ++j) {
      const int cost = lower(a[i - 1]) == lower(b[j - 1]) ? 0 : 1;
      d[i][j] = std::min({d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost});
      if (i > 1 && j > 1 && lower(a[i - 1]) == lower(b[j - 2]) && lower(a[i - 2]) == lower(b[j - 1]))
        d[i][j] = std::min(d[i][j], d[i - 2][j - 2] + 1);
    }
  return d[n][m];
}

}  // namespace

/// User text quoted back in a one-line message: control characters blanked, long text cut.
std::string printable(std::string_view s, std::size_t limit) {
  std::string out;
  for (char c : s.substr(0, limit)) out += (static_cast<unsigned char>(c) < 0x20) ? ' ' : c;
  if (s.size() > limit) out += "...";
  return out;
}

std::string quote_text(std::string_view s) { return "'" + printable(s, 40) + "'"; }

/// "unknown key 'qbits'; did you mean 'qubits'?" — or the list of known keys when nothing is close.
std::string unknown_key_message(const std::string& key, const std::vector<std::string>& known,
                                const std::string& context) {
  const std::string where = context.empty() ? "" : " in " + context;
  const std::string shown = printable(key, 64);
  // Very long keys are certainly not typos of ours; skip the quadratic distance table for them.
  if (key.size() <= 64) {
    // A started word ("calib") means the key it begins.
    for (const auto& k : known)
      if (key.size() >= 3 && k.size() > key.size() && k.compare(0, key.size(), key) == 0)
        return fmt::format("unknown key '{}'{}; did you mean '{}'?", shown, where, k);
    int best = 1 << 30;
    const std::string* nearest = nullptr;
    for (const auto& k : known) {
      const int dist = edit_distance(key, k);
      if (dist < best) {
        best = dist;
        nearest = &k;
      }
    }
    // Only suggest a key that is plausibly what was meant: one or two edits, fewer for short keys.
    const int len = static_cast<int>(key.size());
    if (nearest && (best <= (len <= 3 ? 1 : 2) || best * 3 <= len))
      return fmt::format("unknown key '{}'{}; did you mean '{}'?", shown, where, *nearest);
  }
  std::string list;
  for (const auto& k : known) list += (list.empty() ? "" : ", ") + k;
  return fmt::format("unknown key '{}'{}; known keys: {}", shown, where, list);
}

}  // namespace qftplan::yaml_detail
