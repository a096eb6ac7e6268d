// Why a document is not higher (lode/inspect.h).
#include <algorithm>
#include <set>

#include "lode/clause_check.h"
#include "lode/inspect.h"

namespace lode {
namespace {

// Whether `doc` passes a filter holding one constraint of `f`, per constraint.
Result<std::vector<ClauseVerdict>> filter_verdicts(IndexReader& reader, const DocFilter& f, DocId doc) {
  std::vector<std::pair<std::string, DocFilter>> parts;
  auto part = [&](std::string name, auto set) {
    DocFilter one;
    set(one);
    parts.emplace_back(std::move(name), std::move(one));
  };
  if (!f.kinds.empty()) part("@kind", [&](DocFilter& o) { o.kinds = f.kinds; });
  if (!f.prefixes.empty()) part("@in", [&](DocFilter& o) { o.prefixes = f.prefixes; });
  if (f.date_from) part("@since", [&](DocFilter& o) { o.date_from = f.date_from; });
  if (f.date_to) part("@until", [&](DocFilter& o) { o.date_to = f.date_to; });
  if (!f.author.empty()) part("@by", [&](DocFilter& o) { o.author = f.author; });
  if (f.pages_min || f.pages_max) part("@pages", [&](DocFilter& o) { o.pages_min = f.pages_min, o.pages_max = f.pages_max; });
  if (f.size_min || f.size_max) part("size", [&](DocFilter& o) { o.size_min = f.size_min, o.size_max = f.size_max; });
  std::vector<ClauseVerdict> out;
  for (auto& [name, one] : parts) {
    auto docs = reader.filter(one);
    if (!docs) return docs.status();
    ClauseVerdict v{"filter", name, std::binary_search(docs->begin(), docs->end(), doc), ""};
    v.why = v.holds ? "the document meets " + name : "the " + name + " filter leaves the document out";
    out.push_back(std::move(v));
  }
  return out;
}

Result<ClauseVerdict> clause_verdict(IndexReader& reader, const Clause& c, DocId doc) {
  auto has = clause_holds(reader, c, doc);
  if (!has) return has.status();
  ClauseVerdict v;
  v.text = c.text;
  std::string what = c.phrase ? "the phrase" : "the word";
  if (c.occur == Occur::kMustNot) {
    v.kind = "excluded";
    v.holds = !*has;
    v.why = v.holds ? "the document does not contain " + what + ", as asked"
                    : "the document contains " + what + " the query excludes";
  } else {
    v.kind = c.phrase ? "phrase" : "required";
    v.holds = *has;
    v.why = v.holds ? "the document contains " + what
                    : c.phrase ? "the document lacks the phrase (its words, adjacent and in this order)"
                               : "the document lacks the required word";
  }
  return v;
}

}  // namespace

Result<WhyNot> why_not(Searcher& searcher, IndexReader& reader, std::string_view query, DocId doc,
                       const SearchOptions& options, const WhyNotOptions& wo) {
  WhyNot w;
  {
    auto scope = reader.begin();
    if (!scope) return scope.status();
    auto analyzer = Analyzer::create(reader.settings().analyzer);
    if (!analyzer) return analyzer.status();
    auto q = parse_query(query, **analyzer, options.limits);
    if (!q) return q.status();
    w.dropped = q->warnings;
    std::set<TermId> doc_terms[kFieldCount];
    for (Field f : kAllFields) {
      auto fwd = reader.forward(doc, f);
      if (!fwd) return fwd.status();
      for (auto& [id, tf] : *fwd) doc_terms[static_cast<int>(f)].insert(id);
    }
    for (const Clause& c : q->clauses) {
      if (c.occur == Occur::kMustNot) continue;
      for (const QueryWord& word : c.words) {
        WordPresence p{word.term, c.field};
        p.in_index = false;
        for (Field f : kAllFields) {
          auto info = reader.term(f, word.term);
          if (!info) return info.status();
          if (!*info || (*info)->df == 0) continue;
          p.in_index = true;
          bool has = doc_terms[static_cast<int>(f)].count((*info)->id) > 0;
          (f == Field::kTitle ? p.in_title : p.in_body) = has;
        }
        w.words.push_back(std::move(p));
      }
      if (c.occur == Occur::kMust || c.phrase) {
        auto v = clause_verdict(reader, c, doc);
        if (!v) return v.status();
        w.clauses.push_back(std::move(v.value()));
      }
    }
    for (const Clause& c : q->clauses) {
      if (c.occur != Occur::kMustNot) continue;
      auto v = clause_verdict(reader, c, doc);
      if (!v) return v.status();
      w.clauses.push_back(std::move(v.value()));
    }
    if (!q->filter.empty()) {
      auto fv = filter_verdicts(reader, q->filter, doc);
      if (!fv) return fv.status();
      for (auto& v : *fv) w.clauses.push_back(std::move(v));
    }
  }
  SearchOptions o = options;
  o.top = std::max(wo.max_rank, wo.k);
  o.offset = 0;
  o.breakdown = false;
  o.snippets = false;
  o.count_all = true;
  auto results = searcher.search(query, o);
  if (!results) return results.status();
  w.matched = results->matched;
  for (std::size_t i = 0; i < results->hits.size(); ++i)
    if (results->hits[i].doc == doc) w.rank = i + 1;
  o.breakdown = true;
  auto mine = searcher.explain(query, doc, o);
  if (!mine) return mine.status();
  w.doc = std::move(mine.value());
  bool removed = std::any_of(w.clauses.begin(), w.clauses.end(), [](const ClauseVerdict& v) { return !v.holds; });
  w.matches = w.rank.has_value() || (!removed && !w.doc.breakdown.empty());
  if (wo.k > 0 && results->hits.size() >= wo.k) {
    auto kth = searcher.explain(query, results->hits[wo.k - 1].doc, o);
    if (!kth) return kth.status();
    w.kth = std::move(kth.value());
  }
  return w;
}

}  // namespace lode
