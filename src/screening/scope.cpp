#include "screening/scope.h"

#include "lode/query.h"

namespace lode::screening {
namespace {

// A clause as typed, less its + and field: prefix and quotes: the words a
// reader would say the clause is about.
std::string clause_words(const Clause& c) {
  std::string t = c.text;
  if (!t.empty() && t[0] == '+') t.erase(0, 1);
  if (auto colon = t.find(':'); c.field && colon != std::string::npos) t.erase(0, colon + 1);
  std::erase(t, '"');
  return t;
}

}  // namespace

Result<Scope> sift_scope(IndexReader& reader, const std::string& query) {
  auto analyzer = Analyzer::create(reader.settings().analyzer);
  if (!analyzer) return analyzer.status();
  auto q = parse_query(query, **analyzer);
  if (!q) return q.status();
  Scope s;
  for (const Clause& c : q->clauses)
    if (c.occur != Occur::kMustNot) s.words += (s.words.empty() ? "" : " ") + clause_words(c);
  if (q->filter.empty()) {
    s.docs = live_documents(reader);
  } else {
    auto docs = reader.filter(q->filter);
    if (!docs) return docs.status();
    s.docs = std::move(docs.value());
  }
  return s;
}

Result<std::unique_ptr<SiftEngine>> sift_engine(IndexReader& reader, const std::string& query,
                                                const SiftOptions& options,
                                                const std::vector<SiftJudgment>& judgments) {
  auto scope = sift_scope(reader, query);
  if (!scope) return scope.status();
  auto engine = SiftEngine::create(reader, scope->words, std::move(scope->docs), options);
  if (!engine) return engine.status();
  for (const SiftJudgment& j : judgments) {
    if (j.state != "current") continue;  // changed text goes back to the pool; gone has no vector
    auto id = reader.find_external(j.doc);
    if (id) (*engine)->judge(*id, j.relevant);
  }
  return engine;
}

}  // namespace lode::screening
