// SiftBook: a sift's state from its saved judgments and the index as it is
// now, and proposing the next batch or a check sample (lode/screening.h).
#include <set>

#include "screening/book_impl.h"
#include "screening/scope.h"

namespace lode {

using screening::RawJudgment;

Result<SiftState> SiftBook::state(IndexReader& reader, const std::string& name) {
  auto row = impl_->find(name);
  if (!row) return row.status();
  auto scope = screening::sift_scope(reader, row->summary.query);
  if (!scope) return scope.status();
  std::set<DocId> in_scope(scope->docs.begin(), scope->docs.end());
  auto raw = impl_->judgments(row->id);
  if (!raw) return raw.status();
  auto batches = impl_->batches(row->id);
  if (!batches) return batches.status();

  SiftState st;
  st.summary = row->summary;
  st.summary.batches = batches->size();
  st.scope = in_scope.size();
  std::map<std::string, const SiftJudgment*> current;  // doc -> its judgment, current ones only
  std::size_t judged_in_scope = 0;
  for (RawJudgment& r : *raw) {
    auto id = reader.find_external(r.j.doc);
    if (!id) {
      if (id.status().code() != Code::kNotFound) return id.status();
      r.j.state = "gone";
      ++st.gone;
    } else {
      auto h = content_hash(reader, *id);
      if (!h) return h.status();
      r.j.state = *h == r.content ? "current" : "changed";
      if (r.j.state == "changed") ++st.changed;
      else if (in_scope.count(*id)) ++judged_in_scope;
    }
    st.summary.judged += 1;
    st.summary.relevant += r.j.relevant ? 1 : 0;
    st.judgments.push_back(r.j);
  }
  for (const SiftJudgment& j : st.judgments)
    if (j.state == "current") current[j.doc] = &j;
  st.unjudged = st.scope - judged_in_scope;

  // Review order for the knee rule: judgments answering ranked batches.
  std::set<std::int64_t> checks;
  for (const SiftBatch& b : *batches)
    if (b.check) checks.insert(b.number);
  std::vector<bool> order;
  for (const SiftJudgment& j : st.judgments)
    if (j.state == "current" && j.batch >= 0 && !checks.count(j.batch)) order.push_back(j.relevant);
  st.knee = knee_check(order);

  std::size_t found_now = 0;
  for (auto& [doc, j] : current) found_now += j->relevant ? 1 : 0;
  for (const SiftBatch& b : *batches) {
    std::vector<std::string> pending;
    std::size_t rel = 0;
    for (const std::string& d : b.docs) {
      auto it = current.find(d);
      if (it == current.end()) {
        if (reader.find_external(d).ok()) pending.push_back(d);
      } else {
        rel += it->second->relevant ? 1 : 0;
      }
    }
    if (!pending.empty() && !st.open_batch) {
      st.open_batch = b;
      st.pending = std::move(pending);
    }
    if (b.check && pending.empty())
      st.recall = estimate_recall(b.found_then, found_now, b.remainder, b.docs.size(), rel);
  }
  return st;
}

Result<SiftBatch> SiftBook::next(IndexReader& reader, const std::string& name) {
  auto st = state(reader, name);
  if (!st) return st.status();
  if (st->open_batch) return *st->open_batch;
  LODE_RETURN_IF_ERROR(impl_->need_writable());
  auto row = impl_->find(name);
  if (!row) return row.status();
  auto engine = screening::sift_engine(reader, row->summary.query, row->options, st->judgments);
  if (!engine) return engine.status();
  auto batches = impl_->batches(row->id);
  if (!batches) return batches.status();
  std::size_t ranked = 0;
  for (const SiftBatch& b : *batches) ranked += b.check ? 0 : 1;
  SiftBatch b;
  b.number = static_cast<std::int64_t>(batches->size());
  auto docs = (*engine)->rank(row->options.batch_size(ranked), static_cast<std::uint64_t>(b.number));
  if (!docs) return docs.status();
  if (docs->empty()) return Status::NotFound("sift '" + name + "': every document in scope is judged");
  b.time_ns = screening::now_ns();
  b.model = kSiftModelName;
  b.trained_on = (*engine)->trained_on();
  for (const RankedDoc& r : *docs) {
    auto info = reader.document(r.doc);
    if (!info) return info.status();
    b.docs.push_back(info->external_id);
    b.scores.push_back(r.score);
  }
  LODE_RETURN_IF_ERROR(impl_->record_batch(row->id, b));
  return b;
}

Result<SiftBatch> SiftBook::check_sample(IndexReader& reader, const std::string& name, std::size_t size) {
  LODE_RETURN_IF_ERROR(impl_->need_writable());
  if (size == 0 || size > 10000) return Status::InvalidArgument("check sample size must be 1 to 10000");
  auto st = state(reader, name);
  if (!st) return st.status();
  if (st->open_batch)
    return Status::InvalidArgument("sift '" + name + "': judge batch " + std::to_string(st->open_batch->number) +
                                   " first (" + std::to_string(st->pending.size()) + " left)");
  auto row = impl_->find(name);
  if (!row) return row.status();
  auto engine = screening::sift_engine(reader, row->summary.query, row->options, st->judgments);
  if (!engine) return engine.status();
  SiftBatch b;
  b.number = static_cast<std::int64_t>(st->summary.batches);
  b.check = true;
  b.time_ns = screening::now_ns();
  b.model = kSiftModelName;
  b.remainder = (*engine)->unjudged();
  for (const SiftJudgment& j : st->judgments) b.found_then += j.state == "current" && j.relevant ? 1 : 0;
  for (DocId d : (*engine)->sample(size, 1000000u + static_cast<std::uint64_t>(b.number))) {
    auto info = reader.document(d);
    if (!info) return info.status();
    b.docs.push_back(info->external_id);
    b.scores.push_back(0);
  }
  if (b.docs.empty()) return Status::NotFound("sift '" + name + "': nothing left unjudged to sample");
  LODE_RETURN_IF_ERROR(impl_->record_batch(row->id, b));
  return b;
}

}  // namespace lode
