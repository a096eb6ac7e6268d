// `lode nearest DOC` / `lode nearest --text "passage"`: the documents nearest to it.
#include <cstdio>
#include <iostream>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/explore_options.h"
#include "lode/explore_json.h"
#include "lode/json_text.h"

namespace lode::cli {
namespace {

struct NearestArgs {
  std::string doc, text;
  std::size_t top = 10, query_terms = 30, candidates = 500, shared = 5;
  bool json = false;
  VectorArgs vectors;
};

void print(const SimilarResults& r) {
  for (std::size_t i = 0; i < r.hits.size(); ++i) {
    const SimilarHit& h = r.hits[i];
    std::printf("%3zu  %.4f  %s", i + 1, h.similarity, h.external_id.c_str());
    if (!h.title.empty() && h.title != h.external_id) std::printf("  — %s", h.title.c_str());
    std::printf("\n       shared:");
    for (auto& s : h.shared)
      std::printf(" %s%s %.3f", s.field == Field::kTitle ? "title:" : "", s.term.c_str(), s.share);
    std::printf("\n");
  }
  if (r.hits.empty()) std::printf("no similar document (%zu candidates)\n", r.candidates);
}

}  // namespace

Runner add_nearest_command(CLI::App& app, const Setup& setup) {
  auto a = std::make_shared<NearestArgs>();
  app.add_option("doc", a->doc, "document id as search prints it, or #N");
  app.add_option("--text", a->text, "find documents like this passage instead");
  app.add_option("--top", a->top, "how many documents (default 10)");
  app.add_option("--query-terms", a->query_terms, "heaviest source terms used to find candidates (default 30)");
  app.add_option("--candidates", a->candidates, "candidates scored exactly (default 500)");
  app.add_option("--shared", a->shared, "shared terms listed per document (default 5)");
  app.add_flag("--json", a->json, "print as JSON (schema lode.nearest/1)");
  add_vector_options(app, a->vectors);
  return [a, &setup] {
    if (a->doc.empty() == a->text.empty()) {
      std::fprintf(stderr, "lode: nearest: give either a document or --text\n");
      return int{kExitUsage};
    }
    auto vo = to_vector_options(a->vectors);
    if (!vo) return fail(vo.status());
    SimilarOptions o;
    o.vectors = *vo;
    o.top = a->top;
    o.query_terms = a->query_terms;
    o.candidates = std::max(a->candidates, a->top);
    o.shared_terms = a->shared;
    auto reader = open_reader(setup);
    if (!reader) return int{kExitError};
    nlohmann::json source;
    Result<SimilarResults> r = Status::NotFound("");
    if (!a->doc.empty()) {
      auto doc = named_document(*reader, a->doc);
      if (!doc) return int{kExitError};
      source = {{"doc", a->doc}};
      r = similar_to_document(*reader, *doc, o);
    } else {
      source = {{"text", a->text}};
      r = similar_to_text(*reader, a->text, o);
    }
    if (!r) return fail(r.status());
    if (a->json) std::cout << dump_json(nearest_json(source, *r, o), 2) << "\n";
    else print(*r);
    return int{kExitOk};
  };
}

}  // namespace lode::cli
