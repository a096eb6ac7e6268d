#include "query/filter.h"

#include <charconv>
#include <ctime>
#include <string>

namespace lode::query {
namespace {

Status bad(std::string_view item, std::string_view why) {
  return Status::InvalidArgument("filter '" + std::string(item) + "': " + std::string(why));
}

// "2021", "2021-03", "2021-03-04" -> [start, end] in seconds since the epoch, UTC.
bool parse_date(std::string_view s, std::int64_t& start, std::int64_t& end) {
  int y = 0, m = 0, d = 0;
  auto num = [&](std::string_view part, int& out, int lo, int hi) {
    auto [p, ec] = std::from_chars(part.data(), part.data() + part.size(), out);
    return ec == std::errc() && p == part.data() + part.size() && out >= lo && out <= hi;
  };
  const std::size_t a = s.find('-');
  const std::size_t b = a == std::string_view::npos ? a : s.find('-', a + 1);
  if (!num(s.substr(0, a), y, 1900, 9999)) return false;
  if (a != std::string_view::npos && !num(s.substr(a + 1, b == std::string_view::npos ? b : b - a - 1), m, 1, 12))
    return false;
  if (b != std::string_view::npos && !num(s.substr(b + 1), d, 1, 31)) return false;
  auto at = [](int year, int month, int day) {
    std::tm tm{};
    tm.tm_year = year - 1900;
    tm.tm_mon = month - 1;
    tm.tm_mday = day;
    return static_cast<std::int64_t>(timegm(&tm));  // normalises month 13 and day 32
  };
  if (m == 0) {
    start = at(y, 1, 1);
    end = at(y + 1, 1, 1) - 1;
  } else if (d == 0) {
    start = at(y, m, 1);
    end = at(y, m + 1, 1) - 1;
  } else {
    start = at(y, m, d);
    end = start + 86399;
  }
  return true;
}

// The kinds the readers give documents (lode/ingest.h, Document::kind).
constexpr std::string_view kDocumentKinds = "text markdown jsonl html pdf docx odt epub email";

bool is_document_kind(std::string_view kind) {
  for (std::size_t b = 0; b < kDocumentKinds.size();) {
    std::size_t e = kDocumentKinds.find(' ', b);
    if (e == std::string_view::npos) e = kDocumentKinds.size();
    if (kDocumentKinds.substr(b, e - b) == kind) return true;
    b = e + 1;
  }
  return false;
}

bool parse_count(std::string_view s, std::uint32_t& out) {
  auto [p, ec] = std::from_chars(s.data(), s.data() + s.size(), out);
  return ec == std::errc() && p == s.data() + s.size();
}

}  // namespace

Result<bool> apply_filter_item(std::string_view item, DocFilter& f, std::vector<std::string>& warnings) {
  if (item.size() < 2 || item[0] != '@' || !((item[1] >= 'a' && item[1] <= 'z') || (item[1] >= 'A' && item[1] <= 'Z')))
    return false;
  const std::size_t colon = item.find(':');
  if (colon == std::string_view::npos) return bad(item, "expected @name:value");
  const std::string_view name = item.substr(1, colon - 1), value = item.substr(colon + 1);
  if (value.empty()) return bad(item, "no value after ':'");
  if (name == "kind") {
    for (std::size_t b = 0; b <= value.size();) {
      std::size_t e = value.find(',', b);
      if (e == std::string_view::npos) e = value.size();
      if (e > b) {
        const std::string_view kind = value.substr(b, e - b);
        f.kinds.emplace_back(kind);
        if (!is_document_kind(kind))
          warnings.push_back("@kind:" + std::string(kind) + " matches no document: the kinds are " +
                             std::string(kDocumentKinds));
      }
      b = e + 1;
    }
  } else if (name == "in") {
    f.prefixes.emplace_back(value);
  } else if (name == "since" || name == "until") {
    std::int64_t start = 0, end = 0;
    if (!parse_date(value, start, end)) return bad(item, "dates are YYYY, YYYY-MM or YYYY-MM-DD");
    if (name == "since") f.date_from = start;
    else f.date_to = end;
  } else if (name == "by") {
    f.author = std::string(value);
  } else if (name == "pages") {
    const std::size_t dash = value.find('-');
    std::uint32_t lo = 0, hi = 0;
    const std::string_view a = value.substr(0, dash);
    const std::string_view b = dash == std::string_view::npos ? a : value.substr(dash + 1);
    if ((!a.empty() && !parse_count(a, lo)) || (!b.empty() && !parse_count(b, hi)) || (a.empty() && b.empty()))
      return bad(item, "pages are N, N-M, N- or -M");
    if (!a.empty()) f.pages_min = lo;
    if (!b.empty()) f.pages_max = hi;
  } else {
    return bad(item, std::string("unknown filter (known: ") + kFilterNames + ")");
  }
  return true;
}

}  // namespace lode::query
