// Searcher: parse, gather scoring terms, walk their postings in document
// order with pruning (lode/topk.h), keep the top k, explain them.
#include <algorithm>
#include <functional>
#include <map>
#include <unordered_set>

#include "lode/ranking.h"
#include "lode/topk.h"
#include "ranking/constraint.h"
#include "ranking/feedback.h"
#include "ranking/pages.h"
#include "ranking/scorer.h"
#include "ranking/snippet.h"
#include "ranking/tie_order.h"

namespace lode {
struct Searcher::Impl {
  IndexReader& reader;
  std::unique_ptr<Analyzer> analyzer;

  struct Plan {
    Query query;
    std::vector<rank::ScoringTerm> terms;
    std::vector<rank::ClauseMatcher> required, excluded;
    std::optional<std::vector<DocId>> allowed;  // metadata filters (@kind: ...): live docs, ascending
  };
  Result<Plan> plan(std::string_view text, const SearchOptions& options);
  // (Re)creates the plan's clause matchers; their cursors only move forward, so each pass needs new ones.
  Status make_matchers(Plan& plan);
  // The best `keep` live matches of the plan, best first, ties by the id users
  // see (ranking/tie_order.h), pruned unless count_all (lode/topk.h).
  Result<TopKResult> retrieve(Plan& plan, rank::Scorer& scorer, std::size_t keep, bool count_all);
  // Pseudo-relevance feedback: a first pass over the plan, then RM3 rewrites its terms.
  Status expand(Plan& plan, const SearchOptions& options);
  // plan() followed by expand(): the plan a query is finally scored with.
  Result<Plan> prepare(std::string_view text, const SearchOptions& options);
  Status fill_hit(Hit& hit, Plan& plan, rank::Scorer& scorer, const std::vector<std::uint32_t>& tfs,
                  const SearchOptions& options);
};

namespace {

Status check_options(const SearchOptions& o) {
  if (!(o.bm25.k1 >= 0) || o.bm25.k1 > 1000) return Status::InvalidArgument("k1 must be between 0 and 1000");
  if (!(o.bm25.b >= 0 && o.bm25.b <= 1)) return Status::InvalidArgument("b must be between 0 and 1");
  for (double w : o.field_weight)
    if (!(w >= 0) || w > 1e6) return Status::InvalidArgument("field weights must be between 0 and 1e6");
  if (!(o.smart.log_base > 1)) return Status::InvalidArgument("log base must be greater than 1");
  if (o.feedback.documents > 0 && o.model != Model::kBm25)
    return Status::InvalidArgument("feedback applies to the bm25 model only");
  if (o.proximity.enabled && o.model != Model::kBm25)
    return Status::InvalidArgument("proximity applies to the bm25 model only");
  if (!(o.feedback.original_weight >= 0 && o.feedback.original_weight <= 1))
    return Status::InvalidArgument("feedback original-query weight must be between 0 and 1");
  return Status();
}

}  // namespace

Result<Searcher::Impl::Plan> Searcher::Impl::plan(std::string_view text, const SearchOptions& options) {
  LODE_RETURN_IF_ERROR(check_options(options));
  Plan p;
  auto q = parse_query(text, *analyzer, options.limits, options.reading);
  if (!q) return q.status();
  p.query = std::move(q.value());
  std::map<std::pair<Field, std::string>, double> qtf;  // ordered: deterministic term order
  for (const Clause& c : p.query.clauses) {
    if (c.occur == Occur::kMustNot) continue;
    for (const QueryWord& w : c.words)
      for (Field f : kAllFields)
        if (!c.field || *c.field == f) qtf[{f, w.term}] += 1;
  }
  for (auto& [key, count] : qtf) {
    if (options.field_weight[static_cast<std::size_t>(key.first)] == 0) continue;
    rank::ScoringTerm t;
    t.field = key.first;
    t.term = key.second;
    t.qtf = count;
    auto info = reader.term(key.first, key.second);
    if (!info) return info.status();
    if (info->has_value() && (*info)->df > 0) t.info = **info;
    p.terms.push_back(std::move(t));
  }
  LODE_RETURN_IF_ERROR(make_matchers(p));
  if (!p.query.filter.empty()) {
    auto allowed = reader.filter(p.query.filter);
    if (!allowed) return allowed.status();
    p.allowed = std::move(allowed).value();
  }
  return p;
}

Status Searcher::Impl::make_matchers(Plan& p) {
  p.required.clear();
  p.excluded.clear();
  for (const Clause& c : p.query.clauses) {
    if (c.occur == Occur::kShould && !c.phrase) continue;
    auto m = rank::ClauseMatcher::create(reader, c);
    if (!m) return m.status();
    (c.occur == Occur::kMustNot ? p.excluded : p.required).push_back(std::move(m.value()));
  }
  return Status();
}

Status Searcher::Impl::fill_hit(Hit& hit, Plan& plan, rank::Scorer& scorer,
                                const std::vector<std::uint32_t>& tfs, const SearchOptions& options) {
  auto info = reader.document(hit.doc);
  if (!info) return info.status();
  hit.external_id = info->external_id;
  hit.title = info->title;
  hit.kind = info->kind;
  hit.path = info->path;
  if (options.breakdown) {
    auto s = scorer.score(hit.doc, tfs, &hit.breakdown);
    if (!s) return s.status();
    hit.score = *s;
  }
  if (options.snippets) {
    auto body = reader.stored_text(hit.doc, Field::kBody);
    if (!body) return body.status();
    std::unordered_set<std::string> words;
    for (auto& t : plan.terms) words.insert(t.term);
    auto pages = reader.pages(hit.doc);
    if (!pages) return pages.status();
    std::string_view text = *body;
    if (!pages->empty()) {
      const rank::PageChoice choice = rank::best_page(*body, *pages, *analyzer, words);
      hit.page = choice.page;
      text = choice.text;
    }
    hit.snippet = rank::make_snippet(text, *analyzer, words);
  }
  return Status();
}

Searcher::Searcher(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
Searcher::~Searcher() = default;

Result<std::unique_ptr<Searcher>> Searcher::create(IndexReader& reader) {
  auto analyzer = Analyzer::create(reader.settings().analyzer);
  if (!analyzer) return analyzer.status();
  return std::unique_ptr<Searcher>(new Searcher(std::make_unique<Impl>(Impl{reader, std::move(analyzer.value())})));
}

namespace {

// The plan as lode/topk.h sees it: the scorer's bounds and scores, and the
// plan's filters and clauses deciding which documents may be returned.
class PlanModel final : public TopKModel {
 public:
  // `remake` builds the clause matchers anew (their cursors only go forward).
  PlanModel(const DocNorms& norms, rank::Scorer& scorer, const std::optional<std::vector<DocId>>& allowed,
            std::vector<rank::ClauseMatcher>& required, std::vector<rank::ClauseMatcher>& excluded,
            std::function<Status()> remake)
      : norms_(norms), scorer_(scorer), allowed_(allowed), required_(required), excluded_(excluded),
        remake_(std::move(remake)) {}
  Status restart() override { return required_.empty() && excluded_.empty() ? Status() : remake_(); }
  double term_bound(std::size_t i) const override { return scorer_.term_bound(i); }
  double block_bound(std::size_t i, std::uint32_t tf, std::uint32_t length) const override {
    return scorer_.block_bound(i, tf, length);
  }
  double doc_bound(std::size_t i, std::uint32_t tf, DocId doc) const override { return scorer_.doc_bound(i, tf, doc); }
  std::size_t group(std::size_t i) const override { return scorer_.group(i); }
  double member_raw(std::size_t i, std::uint32_t tf, std::uint32_t length) const override {
    return scorer_.member_raw(i, tf, length);
  }
  double doc_raw(std::size_t i, std::uint32_t tf, DocId doc) const override { return scorer_.doc_raw(i, tf, doc); }
  double group_bound(std::size_t g, double raw) const override { return scorer_.group_bound(g, raw); }
  Result<double> score(DocId doc, const std::vector<std::uint32_t>& tfs) override {
    return scorer_.score(doc, tfs, nullptr);
  }
  // Required clauses and the metadata filter move the walk forward: the
  // first document at or after `doc` that every one of them allows.
  Result<DocId> next_admissible(DocId doc) override {
    DocId d = doc;
    for (bool moved = true; moved && d != kNoDoc;) {
      moved = false;
      if (allowed_) {
        auto it = std::lower_bound(allowed_->begin(), allowed_->end(), d);
        const DocId a = it == allowed_->end() ? kNoDoc : *it;
        if (a != d) d = a, moved = true;
      }
      for (auto& m : required_) {
        if (d == kNoDoc) break;
        auto r = m.next(d);
        if (!r) return r.status();
        if (*r != d) d = *r, moved = true;
      }
    }
    return d;
  }
  Result<bool> admit(DocId doc) override {
    if (!norms_.live(doc)) return false;
    if (allowed_ && !std::binary_search(allowed_->begin(), allowed_->end(), doc)) return false;
    for (auto& m : required_) {
      auto r = m.contains(doc);
      if (!r || !*r) return r;
    }
    for (auto& m : excluded_) {
      auto r = m.contains(doc);
      if (!r) return r;
      if (*r) return false;
    }
    return true;
  }

 private:
  const DocNorms& norms_;
  rank::Scorer& scorer_;
  const std::optional<std::vector<DocId>>& allowed_;
  std::vector<rank::ClauseMatcher>& required_;
  std::vector<rank::ClauseMatcher>& excluded_;
  std::function<Status()> remake_;
};

}  // namespace

Result<TopKResult> Searcher::Impl::retrieve(Plan& plan, rank::Scorer& scorer, std::size_t keep, bool count_all) {
  auto norms = reader.norms();
  if (!norms) return norms.status();
  std::vector<TermId> ids;
  for (const auto& t : plan.terms)
    if (t.info) ids.push_back(t.info->id);
  auto lists = reader.postings_lists(ids);  // one set-based read for the whole query
  if (!lists) return lists.status();
  std::vector<std::unique_ptr<PostingCursor>> owned(plan.terms.size());
  std::vector<PostingCursor*> cursors(plan.terms.size(), nullptr);
  for (std::size_t i = 0, next = 0; i < plan.terms.size(); ++i)
    if (plan.terms[i].info) {
      owned[i] = reader.cursor((*lists)[next++]);
      cursors[i] = owned[i].get();
    }
  // Long lists' impact tiers let the walk read a frequent word's strongest
  // postings first (lode/topk.h); counting every match needs none.
  std::vector<TierCursor> tiers;
  std::vector<std::unique_ptr<PostingCursor>> top_owned;
  if (!count_all && keep > 0) {
    std::vector<TermInfo> infos;
    for (const auto& t : plan.terms)
      if (t.info) infos.push_back(*t.info);
    auto made = reader.impact_tiers(infos);
    if (!made) return made.status();
    tiers.resize(plan.terms.size());
    for (std::size_t i = 0, next = 0; i < plan.terms.size(); ++i)
      if (plan.terms[i].info) {
        const auto& tier = (*made)[next++];
        if (!tier) continue;
        top_owned.push_back(reader.cursor(tier->top));
        tiers[i] = TierCursor{top_owned.back().get(), tier->rest_points};
      }
  }
  PlanModel model(**norms, scorer, plan.allowed, plan.required, plan.excluded, [&] { return make_matchers(plan); });
  auto top = top_k_walk(std::span<PostingCursor* const>(cursors), model, keep, count_all,
                        std::span<const TierCursor>(tiers));
  if (!top) return top.status();
  LODE_RETURN_IF_ERROR(rank::order_by_visible_id(reader, top->ranked, keep));
  return top;
}

Status Searcher::Impl::expand(Plan& plan, const SearchOptions& options) {
  if (options.feedback.documents == 0) return Status();
  rank::Scorer first(reader, options, plan.terms);
  auto top = retrieve(plan, first, options.feedback.documents, false);
  if (!top) return top.status();
  std::vector<rank::FeedbackDoc> docs;
  for (auto& c : top->ranked) docs.push_back(rank::FeedbackDoc{c.doc, c.score});
  LODE_RETURN_IF_ERROR(rank::expand_rm3(reader, options, docs, plan.terms));
  return make_matchers(plan);
}

Result<Searcher::Impl::Plan> Searcher::Impl::prepare(std::string_view text, const SearchOptions& options) {
  auto p = plan(text, options);
  if (!p) return p.status();
  LODE_RETURN_IF_ERROR(expand(*p, options));
  return p;
}

Result<SearchResults> Searcher::search(std::string_view text, const SearchOptions& options) {
  auto& reader = impl_->reader;
  auto scope = reader.begin();
  if (!scope) return scope.status();
  auto plan = impl_->prepare(text, options);
  if (!plan) return plan.status();
  SearchResults results;
  results.warnings = plan->query.warnings;
  rank::Scorer scorer(reader, options, plan->terms);
  auto top = impl_->retrieve(*plan, scorer, options.offset + options.top, options.count_all);
  if (!top) return top.status();
  results.matched = top->matched;
  results.matched_exact = top->matched_exact;
  const std::vector<ScoredDoc>& ranked = top->ranked;
  for (std::size_t i = options.offset; i < ranked.size(); ++i) {
    Hit hit;
    hit.doc = ranked[i].doc;
    hit.score = ranked[i].score;
    LODE_RETURN_IF_ERROR(impl_->fill_hit(hit, *plan, scorer, ranked[i].tfs, options));
    results.hits.push_back(std::move(hit));
  }
  return results;
}

Result<Hit> Searcher::explain(std::string_view text, DocId doc, const SearchOptions& options) {
  auto& reader = impl_->reader;
  auto scope = reader.begin();
  if (!scope) return scope.status();
  auto plan = impl_->prepare(text, options);
  if (!plan) return plan.status();
  rank::Scorer scorer(reader, options, plan->terms);
  std::vector<std::uint32_t> tfs(plan->terms.size());
  for (std::size_t i = 0; i < plan->terms.size(); ++i) {
    if (!plan->terms[i].info) continue;
    auto c = reader.postings(*plan->terms[i].info);
    c->seek(doc);
    if (!c->status().ok()) return c->status();
    if (c->valid() && c->doc() == doc) tfs[i] = c->tf();
  }
  Hit hit;
  hit.doc = doc;
  auto score = scorer.score(doc, tfs, nullptr);
  if (!score) return score.status();
  hit.score = *score;
  LODE_RETURN_IF_ERROR(impl_->fill_hit(hit, *plan, scorer, tfs, options));
  return hit;
}

}  // namespace lode
