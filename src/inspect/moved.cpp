// One query under two settings (lode/inspect.h).
#include <algorithm>
#include <cmath>
#include <map>

#include "lode/inspect.h"

namespace lode {
namespace {

using Key = std::pair<std::string, Field>;

std::map<Key, double> contributions(const Hit& h) {
  std::map<Key, double> m;
  for (const TermContribution& c : h.breakdown) m[{c.term, c.field}] += c.contribution;
  return m;
}

}  // namespace

Result<Moved> what_moved(Searcher& searcher, std::string_view query, const SearchOptions& before,
                         const SearchOptions& after, const MovedOptions& o) {
  auto run = [&](SearchOptions s) {
    s.top = o.depth;
    s.offset = 0;
    s.snippets = false;
    s.breakdown = false;
    return searcher.search(query, s);
  };
  auto a = run(before);
  if (!a) return a.status();
  auto b = run(after);
  if (!b) return b.status();
  std::map<DocId, std::size_t> rank_a, rank_b;
  for (std::size_t i = 0; i < a->hits.size(); ++i) rank_a[a->hits[i].doc] = i + 1;
  for (std::size_t i = 0; i < b->hits.size(); ++i) rank_b[b->hits[i].doc] = i + 1;
  std::vector<DocId> order;
  for (auto& h : b->hits) order.push_back(h.doc);
  for (auto& h : a->hits)
    if (!rank_b.count(h.doc)) order.push_back(h.doc);

  Moved m;
  for (DocId d : order) {
    MovedDoc md;
    SearchOptions sa = before, sb = after;
    sa.breakdown = sb.breakdown = true;
    auto ea = searcher.explain(query, d, sa);
    if (!ea) return ea.status();
    auto eb = searcher.explain(query, d, sb);
    if (!eb) return eb.status();
    md.before = std::move(ea.value());
    md.after = std::move(eb.value());
    if (auto it = rank_a.find(d); it != rank_a.end()) md.rank_before = it->second;
    if (auto it = rank_b.find(d); it != rank_b.end()) md.rank_after = it->second;
    if (!md.rank_before) md.change = "entered", ++m.entered;
    else if (!md.rank_after) md.change = "left", ++m.left;
    else if (*md.rank_after < *md.rank_before) md.change = "up", ++m.up;
    else if (*md.rank_after > *md.rank_before) md.change = "down", ++m.down;
    else md.change = "same", ++m.same;
    auto ca = contributions(md.before), cb = contributions(md.after);
    std::map<Key, std::pair<double, double>> both;
    for (auto& [k, v] : ca) both[k].first = v;
    for (auto& [k, v] : cb) both[k].second = v;
    for (auto& [k, v] : both)
      if (std::fabs(v.first - v.second) > o.epsilon) md.shifts.push_back({k.first, k.second, v.first, v.second});
    std::stable_sort(md.shifts.begin(), md.shifts.end(), [](const TermShift& x, const TermShift& y) {
      return std::fabs(x.after - x.before) > std::fabs(y.after - y.before);
    });
    m.docs.push_back(std::move(md));
  }
  return m;
}

}  // namespace lode
