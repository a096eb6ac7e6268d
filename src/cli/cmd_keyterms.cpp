// `lode keyterms DOC` / `lode keyterms --query "q"`: what documents are about.
#include <cstdio>
#include <iostream>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/explore_options.h"
#include "lode/explore_json.h"
#include "lode/json_text.h"

namespace lode::cli {
namespace {

struct KeyTermArgs {
  std::string doc, query;
  std::size_t top = 15, hits = 50;
  bool json = false;
  VectorArgs vectors;
};

void print(const KeyTermResults& r) {
  for (auto& w : r.warnings) std::fprintf(stderr, "lode: note: %s\n", w.c_str());
  if (r.documents.size() > 1) std::printf("key terms of %zu documents\n", r.documents.size());
  std::printf("%3s  %-24s %-20s %8s %7s %8s\n", "", "word", "term", "weight", "occurs", "docs");
  for (std::size_t i = 0; i < r.terms.size(); ++i) {
    const KeyTerm& k = r.terms[i];
    std::printf("%3zu  %-24s %-20s %8.4f %7u %8llu\n", i + 1, k.surface.c_str(), k.term.c_str(), k.weight,
                k.occurrences, static_cast<unsigned long long>(k.df));
  }
}

}  // namespace

Runner add_keyterms_command(CLI::App& app, const Setup& setup) {
  auto a = std::make_shared<KeyTermArgs>();
  app.add_option("doc", a->doc, "document id as search prints it, or #N");
  app.add_option("--query", a->query, "key terms of this search's top hits instead");
  app.add_option("--hits", a->hits, "with --query: how many hits to take (default 50)");
  app.add_option("--top", a->top, "how many terms (default 15)");
  app.add_flag("--json", a->json, "print as JSON (schema lode.keyterms/1)");
  add_vector_options(app, a->vectors);
  return [a, &setup] {
    if (a->doc.empty() == a->query.empty()) {
      std::fprintf(stderr, "lode: keyterms: give either a document or --query\n");
      return int{kExitUsage};
    }
    auto vo = to_vector_options(a->vectors);
    if (!vo) return fail(vo.status());
    KeyTermOptions o;
    o.vectors = *vo;
    o.top = a->top;
    o.hits = a->hits;
    auto reader = open_reader(setup);
    if (!reader) return int{kExitError};
    nlohmann::json source;
    Result<KeyTermResults> r = Status::NotFound("");
    if (!a->doc.empty()) {
      auto doc = named_document(*reader, a->doc);
      if (!doc) return int{kExitError};
      source = {{"doc", a->doc}};
      r = key_terms_of_document(*reader, *doc, o);
    } else {
      // The hits are found with search's default ranking (BM25).
      source = {{"query", a->query}, {"hits", a->hits}};
      r = key_terms_of_query(*reader, a->query, SearchOptions{}, o);
    }
    if (!r) return fail(r.status());
    if (a->json) std::cout << dump_json(keyterms_json(source, *r, o), 2) << "\n";
    else print(*r);
    return int{kExitOk};
  };
}

}  // namespace lode::cli
