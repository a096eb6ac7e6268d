#include "ranking/constraint.h"

#include <algorithm>

#include "lode/topk.h"

namespace lode::rank {

Result<ClauseMatcher> ClauseMatcher::create(IndexReader& reader, const Clause& clause) {
  ClauseMatcher m;
  m.phrase_ = clause.phrase;
  for (Field f : kAllFields) {
    if (clause.field && *clause.field != f) continue;
    FieldCursors fc;
    bool all_known = true;
    for (const QueryWord& w : clause.words) {
      auto info = reader.term(f, w.term);
      if (!info) return info.status();
      if (!info->has_value() || (*info)->df == 0) {
        all_known = false;
        break;
      }
      fc.words.push_back(reader.postings(**info));
      fc.offsets.push_back(w.offset);
    }
    if (all_known) m.fields_.push_back(std::move(fc));
  }
  return m;
}

Result<DocId> ClauseMatcher::next(DocId doc) {
  DocId best = kNoDoc;
  for (FieldCursors& fc : fields_) {
    // Leapfrog: move every word to the largest current doc until they agree.
    DocId d = doc;
    bool agree = false;
    while (!agree && d < best) {
      agree = true;
      for (auto& c : fc.words) {
        c->seek(d);
        if (!c->status().ok()) return c->status();
        if (!c->valid()) {
          d = kNoDoc;
          break;
        }
        if (c->doc() != d) {
          d = c->doc();
          agree = false;
          break;
        }
      }
    }
    best = std::min(best, d);
  }
  return best;
}

Result<bool> ClauseMatcher::contains(DocId doc) {
  for (FieldCursors& fc : fields_) {
    bool all = true;
    for (auto& c : fc.words) {
      c->seek(doc);
      if (!c->status().ok()) return c->status();
      if (!c->valid() || c->doc() != doc) all = false;
    }
    if (!all) continue;
    if (!phrase_) return true;
    // Positions of the phrase start that every word agrees on.
    auto first = fc.words[0]->positions();
    if (!first) return first.status();
    std::vector<std::uint32_t> starts = *first;
    for (std::size_t i = 1; i < fc.words.size() && !starts.empty(); ++i) {
      auto pos = fc.words[i]->positions();
      if (!pos) return pos.status();
      std::vector<std::uint32_t> keep;
      std::uint32_t off = fc.offsets[i];
      for (auto s : starts)
        if (std::binary_search(pos->begin(), pos->end(), s + off)) keep.push_back(s);
      starts.swap(keep);
    }
    if (!starts.empty()) return true;
  }
  return false;
}

}  // namespace lode::rank
