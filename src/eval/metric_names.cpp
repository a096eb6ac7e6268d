// Metric names as typed on the command line ("map", "ndcg@10", ...).
#include <charconv>

#include "lode/eval.h"

namespace lode {
namespace {

struct NamedKind {
  std::string_view name;
  MetricKind kind;
  bool has_cutoff;
};
constexpr NamedKind kKinds[] = {
    {"map", MetricKind::kAp, false},           {"ndcg", MetricKind::kNdcg, true},
    {"p", MetricKind::kPrecision, true},       {"recall", MetricKind::kRecall, true},
    {"rprec", MetricKind::kRPrecision, false}, {"rr", MetricKind::kReciprocalRank, false},
};

}  // namespace

Result<Metric> parse_metric(std::string_view name) {
  auto at = name.find('@');
  std::string_view base = name.substr(0, at);
  for (const NamedKind& nk : kKinds) {
    if (nk.name != base) continue;
    Metric m{nk.kind, 0};
    if (at == std::string_view::npos) return m;
    std::string_view digits = name.substr(at + 1);
    auto r = std::from_chars(digits.data(), digits.data() + digits.size(), m.k);
    if (!nk.has_cutoff || digits.empty() || r.ec != std::errc() || r.ptr != digits.data() + digits.size() || m.k == 0)
      break;
    return m;
  }
  return Status::InvalidArgument("metric '" + std::string(name) +
                                 "' is not one of map, ndcg@K, p@K, recall@K, rprec, rr (K a positive count)");
}

std::string metric_name(const Metric& m, const EvalOptions& options) {
  for (const NamedKind& nk : kKinds) {
    if (nk.kind != m.kind) continue;
    if (!nk.has_cutoff) return std::string(nk.name);
    std::size_t k = m.k ? m.k : (m.kind == MetricKind::kRecall ? options.depth : options.k);
    return std::string(nk.name) + "@" + std::to_string(k);
  }
  return "?";
}

}  // namespace lode
