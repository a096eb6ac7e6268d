#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>

#include "lode/eval.h"

namespace lode {
namespace {

std::vector<std::string_view> fields_of(std::string_view line) {
  std::vector<std::string_view> out;
  std::size_t i = 0;
  while (i < line.size()) {
    while (i < line.size() && (line[i] == ' ' || line[i] == '\t' || line[i] == '\r')) ++i;
    std::size_t s = i;
    while (i < line.size() && line[i] != ' ' && line[i] != '\t' && line[i] != '\r') ++i;
    if (i > s) out.push_back(line.substr(s, i - s));
  }
  return out;
}

template <typename F>
Status for_each_line(std::string_view text, F&& f) {
  std::size_t line_no = 0, pos = 0;
  while (pos <= text.size()) {
    std::size_t nl = text.find('\n', pos);
    std::string_view line = text.substr(pos, nl == std::string_view::npos ? std::string_view::npos : nl - pos);
    ++line_no;
    LODE_RETURN_IF_ERROR(f(line, line_no));
    if (nl == std::string_view::npos) break;
    pos = nl + 1;
  }
  return Status();
}

Result<std::string> slurp(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) return Status::NotFound(path + ": cannot open");
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

std::string where(std::string_view source, std::size_t line) {
  return std::string(source) + ":" + std::to_string(line) + ": ";
}

}  // namespace

Result<Qrels> parse_qrels(std::string_view text, std::string_view source) {
  Qrels q;
  Status s = for_each_line(text, [&](std::string_view line, std::size_t n) -> Status {
    auto f = fields_of(line);
    if (f.empty()) return Status();
    if (f.size() != 4) return Status::InvalidArgument(where(source, n) + "expected 'qid 0 docid grade'");
    int grade = 0;
    auto r = std::from_chars(f[3].data(), f[3].data() + f[3].size(), grade);
    if (r.ec != std::errc() || r.ptr != f[3].data() + f[3].size())
      return Status::InvalidArgument(where(source, n) + "grade '" + std::string(f[3]) + "' is not an integer");
    q[std::string(f[0])][std::string(f[2])] = grade;
    return Status();
  });
  if (!s.ok()) return s;
  return q;
}

Result<Qrels> read_qrels(const std::string& path) {
  auto text = slurp(path);
  if (!text) return text.status();
  return parse_qrels(*text, path);
}

Result<Run> parse_run(std::string_view text, std::string_view source) {
  Run run;
  std::set<std::pair<std::string, std::string>> seen;
  Status s = for_each_line(text, [&](std::string_view line, std::size_t n) -> Status {
    auto f = fields_of(line);
    if (f.empty()) return Status();
    if (f.size() != 6) return Status::InvalidArgument(where(source, n) + "expected 'qid Q0 docid rank score tag'");
    double score = 0;
    auto r = std::from_chars(f[4].data(), f[4].data() + f[4].size(), score);
    if (r.ec != std::errc() || r.ptr != f[4].data() + f[4].size() || !std::isfinite(score))
      return Status::InvalidArgument(where(source, n) + "score '" + std::string(f[4]) + "' is not a finite number");
    if (!seen.emplace(std::string(f[0]), std::string(f[2])).second)
      return Status::InvalidArgument(where(source, n) + "document '" + std::string(f[2]) +
                                     "' is listed twice for query '" + std::string(f[0]) + "'");
    run[std::string(f[0])].push_back(RunEntry{std::string(f[2]), score});
    return Status();
  });
  if (!s.ok()) return s;
  for (auto& [qid, entries] : run)
    std::stable_sort(entries.begin(), entries.end(),
                     [](const RunEntry& a, const RunEntry& b) { return a.score > b.score; });
  return run;
}

Result<Run> read_run(const std::string& path) {
  auto text = slurp(path);
  if (!text) return text.status();
  return parse_run(*text, path);
}

std::string format_run_line(std::string_view qid, std::string_view docid, std::size_t rank, double score,
                            std::string_view tag) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.6f", score);
  return std::string(qid) + " Q0 " + std::string(docid) + " " + std::to_string(rank) + " " + buf + " " +
         std::string(tag);
}

std::string format_run(const Run& run, std::string_view tag) {
  std::string out;
  for (auto& [qid, entries] : run)
    for (std::size_t i = 0; i < entries.size(); ++i)
      out += format_run_line(qid, entries[i].docid, i + 1, entries[i].score, tag) + "\n";
  return out;
}

namespace {

// One JSON Lines query: {"id": ..., "text": ...}; a numeric id is accepted as its decimal text.
Result<QueryLine> json_query(std::string_view line, const std::string& at) {
  auto j = nlohmann::json::parse(line, nullptr, false);
  if (j.is_discarded() || !j.is_object()) return Status::InvalidArgument(at + "not a JSON object");
  QueryLine q;
  auto id = j.find("id");
  if (id != j.end() && id->is_string()) q.id = id->get<std::string>();
  else if (id != j.end() && id->is_number_integer()) q.id = std::to_string(id->get<long long>());
  auto text = j.find("text");
  if (text != j.end() && text->is_string()) q.text = text->get<std::string>();
  if (q.id.empty() || text == j.end() || !text->is_string())
    return Status::InvalidArgument(at + "expected string fields \"id\" and \"text\"");
  return q;
}

}  // namespace

Result<std::vector<QueryLine>> parse_queries(std::string_view text, std::string_view source) {
  std::vector<QueryLine> out;
  std::set<std::string> ids;
  Status s = for_each_line(text, [&](std::string_view line, std::size_t n) -> Status {
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    if (line.empty() || line[0] == '#') return Status();
    QueryLine q;
    if (line[0] == '{') {
      auto j = json_query(line, where(source, n));
      if (!j) return j.status();
      q = std::move(j.value());
    } else {
      auto tab = line.find('\t');
      if (tab == std::string_view::npos || tab == 0)
        return Status::InvalidArgument(where(source, n) + "expected 'id<TAB>query text'");
      q = QueryLine{std::string(line.substr(0, tab)), std::string(line.substr(tab + 1))};
    }
    if (!ids.insert(q.id).second)
      return Status::InvalidArgument(where(source, n) + "query id '" + q.id + "' appears twice");
    out.push_back(std::move(q));
    return Status();
  });
  if (!s.ok()) return s;
  return out;
}

Result<std::vector<QueryLine>> read_queries(const std::string& path) {
  auto text = slurp(path);
  if (!text) return text.status();
  return parse_queries(*text, path);
}

}  // namespace lode
