// Running a queries file through a Searcher, and grids over BM25 parameters
// and field weights. Parameters only change per query, so a sweep reads the
// same index for every setting and never writes it.
#include <charconv>
#include <cmath>
#include <set>

#include "lode/eval.h"

namespace lode {

Result<Run> run_queries(Searcher& searcher, const std::vector<QueryLine>& queries, SearchOptions options,
                        std::size_t depth) {
  options.top = depth;
  options.offset = 0;
  options.breakdown = false;
  options.snippets = false;
  Run run;
  for (const QueryLine& q : queries) {
    auto results = searcher.search(q.text, options);
    if (!results) return Status(results.status().code() == Code::kInvalidArgument
                                    ? Status::InvalidArgument("query " + q.id + ": " + results.status().message())
                                    : results.status());
    auto& entries = run[q.id];
    for (const Hit& h : results->hits) entries.push_back(RunEntry{h.external_id, h.score});
  }
  return run;
}

std::string_view sweep_param_name(SweepParam p) {
  switch (p) {
    case SweepParam::kK1: return "k1";
    case SweepParam::kB: return "b";
    case SweepParam::kTitleWeight: return "title-weight";
    case SweepParam::kBodyWeight: return "body-weight";
  }
  return "?";
}

void apply_sweep_param(SearchOptions& o, SweepParam param, double value) {
  switch (param) {
    case SweepParam::kK1: o.bm25.k1 = value; break;
    case SweepParam::kB: o.bm25.b = value; break;
    case SweepParam::kTitleWeight: o.field_weight[static_cast<std::size_t>(Field::kTitle)] = value; break;
    case SweepParam::kBodyWeight: o.field_weight[static_cast<std::size_t>(Field::kBody)] = value; break;
  }
}

namespace {

Result<double> number(std::string_view s, std::string_view spec) {
  double v = 0;
  auto r = std::from_chars(s.data(), s.data() + s.size(), v);
  if (s.empty() || r.ec != std::errc() || r.ptr != s.data() + s.size() || !std::isfinite(v))
    return Status::InvalidArgument("sweep values '" + std::string(spec) + "': '" + std::string(s) +
                                   "' is not a number");
  return v;
}

constexpr std::size_t kMaxValues = 10000;

}  // namespace

Result<std::vector<double>> parse_sweep_values(std::string_view spec) {
  std::vector<double> out;
  std::string bad = "sweep values '" + std::string(spec) + "': ";
  if (spec.find(':') != std::string_view::npos) {
    std::vector<double> parts;
    std::size_t at = 0;
    while (true) {
      auto colon = spec.find(':', at);
      auto v = number(spec.substr(at, colon == std::string_view::npos ? colon : colon - at), spec);
      if (!v) return v.status();
      parts.push_back(*v);
      if (colon == std::string_view::npos) break;
      at = colon + 1;
    }
    if (parts.size() != 3) return Status::InvalidArgument(bad + "expected start:stop:step");
    auto [start, stop, step] = std::array<double, 3>{parts[0], parts[1], parts[2]};
    if (!(step > 0)) return Status::InvalidArgument(bad + "step must be positive");
    if (stop < start) return Status::InvalidArgument(bad + "stop is below start");
    if ((stop - start) / step > static_cast<double>(kMaxValues))
      return Status::InvalidArgument(bad + "more than 10000 values");
    // Multiply rather than add, so 0:1:0.1 gives 0.3 and not 0.30000000000000004 drifting on.
    for (std::size_t i = 0; start + static_cast<double>(i) * step <= stop + 1e-9; ++i)
      out.push_back(std::round((start + static_cast<double>(i) * step) * 1e9) / 1e9);
    return out;
  }
  std::size_t at = 0;
  while (true) {
    auto comma = spec.find(',', at);
    auto v = number(spec.substr(at, comma == std::string_view::npos ? comma : comma - at), spec);
    if (!v) return v.status();
    out.push_back(*v);
    if (out.size() > kMaxValues) return Status::InvalidArgument(bad + "more than 10000 values");
    if (comma == std::string_view::npos) break;
    at = comma + 1;
  }
  return out;
}

Result<SweepResult> sweep(Searcher& searcher, const std::vector<QueryLine>& queries, const Qrels& qrels,
                          const SearchOptions& base, const std::vector<SweepAxis>& axes, const Metric& metric,
                          const EvalOptions& eval, const std::function<void(std::size_t, std::size_t)>& progress) {
  if (axes.empty()) return Status::InvalidArgument("a sweep needs at least one parameter with values");
  std::set<SweepParam> seen;
  std::size_t total = 1;
  for (auto& a : axes) {
    std::string name(sweep_param_name(a.param));
    if (a.values.empty()) return Status::InvalidArgument("sweep over " + name + " has no values");
    if (!seen.insert(a.param).second) return Status::InvalidArgument("sweep over " + name + " given twice");
    total *= a.values.size();
    if (total > 100000) return Status::InvalidArgument("sweep grid has more than 100000 settings");
  }
  SweepResult out;
  out.axes = axes;
  out.metric = metric;
  out.eval = eval;
  std::vector<std::size_t> at(axes.size(), 0);  // odometer over the grid, last axis fastest
  for (std::size_t done = 0; done < total; ++done) {
    SearchOptions o = base;
    SweepCell cell;
    for (std::size_t i = 0; i < axes.size(); ++i) {
      cell.setting.push_back(axes[i].values[at[i]]);
      apply_sweep_param(o, axes[i].param, axes[i].values[at[i]]);
    }
    auto run = run_queries(searcher, queries, o, eval.depth);
    if (!run) return run.status();
    auto values = per_query_metric(*run, qrels, metric, eval);
    for (auto& [qid, v] : values) cell.value += v / static_cast<double>(values.size());
    if (out.cells.empty() || cell.value > out.cells[out.best].value) out.best = out.cells.size();
    out.cells.push_back(std::move(cell));
    if (progress) progress(done + 1, total);
    for (std::size_t i = axes.size(); i-- > 0;) {
      if (++at[i] < axes[i].values.size()) break;
      at[i] = 0;
    }
  }
  return out;
}

}  // namespace lode
