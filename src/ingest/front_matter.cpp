#include "ingest/front_matter.h"

#include <charconv>
#include <ctime>

#include "ingest/text_util.h"

namespace lode::ingest {
namespace {

std::string_view unquote(std::string_view v) {
  if (v.size() >= 2 && (v[0] == '"' || v[0] == '\'') && v.back() == v[0]) v = v.substr(1, v.size() - 2);
  return v;
}

// "1987-10-16" (then anything: "T18:00", " 18:00") -> midnight UTC; 0 otherwise.
std::int64_t parse_day(std::string_view v) {
  int y = 0, m = 0, d = 0;
  auto num = [&](std::size_t at, std::size_t len, int& out, int lo, int hi) {
    if (v.size() < at + len) return false;
    auto [p, ec] = std::from_chars(v.data() + at, v.data() + at + len, out);
    return ec == std::errc() && p == v.data() + at + len && out >= lo && out <= hi;
  };
  if (!num(0, 4, y, 1, 9999) || v.size() < 10 || v[4] != '-' || v[7] != '-' || !num(5, 2, m, 1, 12) ||
      !num(8, 2, d, 1, 31))
    return 0;
  std::tm tm{};
  tm.tm_year = y - 1900;
  tm.tm_mon = m - 1;
  tm.tm_mday = d;
  return static_cast<std::int64_t>(timegm(&tm));
}

}  // namespace

FrontMatter front_matter(const std::vector<std::string_view>& lines) {
  FrontMatter fm;
  if (lines.empty() || trim(lines[0]) != "---") return fm;
  std::size_t end = 1;
  while (end < lines.size() && trim(lines[end]) != "---" && trim(lines[end]) != "...") ++end;
  if (end == lines.size()) return fm;  // never closed: an ordinary line
  fm.body_start = end + 1;
  for (std::size_t i = 1; i < end; ++i) {
    const std::string_view line = lines[i];
    if (line.substr(0, 7) == "author:") fm.author = std::string(unquote(trim(line.substr(7))));
    if (line.substr(0, 5) == "date:") fm.date = parse_day(unquote(trim(line.substr(5))));
    if (line.substr(0, 6) != "title:" || !fm.title.empty()) continue;
    std::string_view v = unquote(trim(line.substr(6)));
    if (v != "|" && v != ">" && v != "|-" && v != ">-") {
      fm.title = make_title(v);
      continue;
    }
    // Block scalar: the indented lines that follow, joined with spaces.
    std::string joined;
    for (std::size_t k = i + 1; k < end; ++k) {
      if (lines[k].empty() || (lines[k][0] != ' ' && lines[k][0] != '\t')) break;
      if (!joined.empty()) joined += ' ';
      joined += trim(lines[k]);
    }
    fm.title = make_title(joined);
  }
  return fm;
}

}  // namespace lode::ingest
