// SiftEngine: continuous active learning over in-memory TF-IDF vectors
// (lode/screening.h). Every in-scope vector is read once from the forward
// index; each round trains on the judgments, the synthetic query document and
// a fresh random sample of unjudged documents presumed not relevant, then
// scores every unjudged document.
#include <algorithm>
#include <cmath>
#include <random>

#include "lode/ranking.h"
#include "lode/screening.h"

namespace lode {

std::size_t SiftOptions::batch_size(std::size_t n) const {
  std::size_t b = first_batch;
  for (std::size_t i = 0; i < n && b < max_batch; ++i)
    b += static_cast<std::size_t>(std::ceil(growth * static_cast<double>(b)));
  return std::min(b, max_batch);
}

Status SiftOptions::check() const {
  LODE_RETURN_IF_ERROR(vectors.check());
  if (first_batch == 0 || max_batch == 0 || first_batch > max_batch)
    return Status::InvalidArgument("sift: first batch must be between 1 and the largest batch (" +
                                   std::to_string(max_batch) + ")");
  if (!(growth >= 0) || growth > 10) return Status::InvalidArgument("sift: growth must be between 0 and 10");
  if (!(classifier.cost > 0) || classifier.cost > 1e6) return Status::InvalidArgument("sift: cost must be in (0, 1e6]");
  return Status();
}

struct SiftEngine::Impl {
  SiftOptions options;
  std::vector<DocId> scope;                  // ascending
  std::vector<SparseVector> vectors;         // parallel to scope
  std::unordered_map<DocId, std::size_t> slot;
  std::vector<signed char> label;            // -1 unjudged, 0 not relevant, 1 relevant
  SparseVector query;                        // synthetic relevant document (may be empty)
  std::size_t judged = 0;
  std::size_t trained_on = 0;
};

SiftEngine::SiftEngine(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
SiftEngine::~SiftEngine() = default;

Result<std::unique_ptr<SiftEngine>> SiftEngine::create(IndexReader& reader, std::string_view query_text,
                                                       std::vector<DocId> scope, const SiftOptions& options) {
  LODE_RETURN_IF_ERROR(options.check());
  auto impl = std::make_unique<Impl>();
  impl->options = options;
  std::sort(scope.begin(), scope.end());
  scope.erase(std::unique(scope.begin(), scope.end()), scope.end());
  VectorSource source(reader, options.vectors);
  impl->vectors.reserve(scope.size());
  for (DocId d : scope) {
    auto v = source.document(d);
    if (!v) return v.status();
    impl->slot.emplace(d, impl->vectors.size());
    impl->vectors.push_back(std::move(v.value()));
  }
  impl->scope = std::move(scope);
  impl->label.assign(impl->scope.size(), -1);
  if (!query_text.empty()) {
    auto analyzer = Analyzer::create(reader.settings().analyzer);
    if (!analyzer) return analyzer.status();
    auto q = source.passage(query_text, **analyzer);
    if (!q) return q.status();
    impl->query = std::move(q.value());
  }
  return std::unique_ptr<SiftEngine>(new SiftEngine(std::move(impl)));
}

void SiftEngine::judge(DocId doc, bool relevant) {
  auto it = impl_->slot.find(doc);
  if (it == impl_->slot.end()) return;
  signed char& l = impl_->label[it->second];
  if (l < 0) ++impl_->judged;
  l = relevant ? 1 : 0;
}

bool SiftEngine::judged(DocId doc) const {
  auto it = impl_->slot.find(doc);
  return it != impl_->slot.end() && impl_->label[it->second] >= 0;
}
std::size_t SiftEngine::scope_size() const { return impl_->scope.size(); }
std::size_t SiftEngine::unjudged() const { return impl_->scope.size() - impl_->judged; }
std::size_t SiftEngine::trained_on() const { return impl_->trained_on; }

std::vector<DocId> SiftEngine::sample(std::size_t n, std::uint64_t round) const {
  std::vector<DocId> pool;
  for (std::size_t i = 0; i < impl_->scope.size(); ++i)
    if (impl_->label[i] < 0) pool.push_back(impl_->scope[i]);
  std::mt19937_64 rng(impl_->options.seed * 1000003u + round);
  std::vector<DocId> out;
  std::sample(pool.begin(), pool.end(), std::back_inserter(out), std::min(n, pool.size()), rng);
  std::shuffle(out.begin(), out.end(), rng);
  return out;
}

Result<std::vector<RankedDoc>> SiftEngine::rank(std::size_t n, std::uint64_t round) {
  Impl& m = *impl_;
  std::vector<const SparseVector*> x;
  std::vector<bool> y;
  if (!m.query.empty()) {
    x.push_back(&m.query);
    y.push_back(true);
  }
  for (std::size_t i = 0; i < m.scope.size(); ++i) {
    if (m.label[i] < 0 || m.vectors[i].empty()) continue;
    x.push_back(&m.vectors[i]);
    y.push_back(m.label[i] == 1);
  }
  m.trained_on = m.judged;
  if (std::find(y.begin(), y.end(), true) == y.end())
    return Status::InvalidArgument("sift: nothing relevant to learn from yet (the query has no indexed words and "
                                   "no document is judged relevant)");
  // Unjudged documents presumed not relevant: most of any collection is, and
  // without negatives there is nothing to separate.
  for (DocId d : sample(m.options.presumed_negatives, round)) {
    const SparseVector& v = m.vectors[m.slot.at(d)];
    if (v.empty()) continue;
    x.push_back(&v);
    y.push_back(false);
  }
  if (std::find(y.begin(), y.end(), false) == y.end()) {
    static const SparseVector kEmpty;  // the empty document: "nothing said" is not relevant
    x.push_back(&kEmpty);
    y.push_back(false);
  }
  auto model = train_logistic(x, y, m.options.classifier);
  if (!model) return model.status();
  std::vector<RankedDoc> out;
  for (std::size_t i = 0; i < m.scope.size(); ++i)
    if (m.label[i] < 0) out.push_back({m.scope[i], model->score(m.vectors[i])});
  auto better = [](const RankedDoc& a, const RankedDoc& b) { return a.score != b.score ? a.score > b.score : a.doc < b.doc; };
  std::size_t k = std::min(n, out.size());
  std::partial_sort(out.begin(), out.begin() + static_cast<std::ptrdiff_t>(k), out.end(), better);
  out.resize(k);
  return out;
}

}  // namespace lode
