// `lode twins`: groups of near-duplicate documents across the index.
#include <cstdio>
#include <iostream>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/explore_options.h"
#include "lode/explore_json.h"
#include "lode/json_text.h"

namespace lode::cli {

Runner add_twins_command(CLI::App& app, const Setup& setup) {
  struct Args {
    double threshold = 0.9;
    std::size_t shingle = 1, top_terms = TwinOptions{}.top_terms, bands = 32, rows = 4;
    std::uint64_t seed = 1;
    bool json = false, quiet = false;
    VectorArgs vectors;
  };
  auto a = std::make_shared<Args>();
  app.add_option("--threshold", a->threshold, "minimum cosine similarity of a pair (default 0.9)");
  app.add_option("--shingle", a->shingle, "words per shingle; 1 = index terms (default 1)");
  app.add_option("--top-terms", a->top_terms,
                 "with --shingle 1: the heaviest terms hashed per document; 0 = all (default " +
                     std::to_string(a->top_terms) + ")");
  app.add_option("--bands", a->bands, "LSH bands (default 32)");
  app.add_option("--rows", a->rows, "MinHash values per band (default 4)");
  app.add_option("--seed", a->seed, "hash seed (default 1)");
  app.add_flag("--json", a->json, "print as JSON (schema lode.twins/1)");
  app.add_flag("-q,--quiet", a->quiet, "no progress on the terminal");
  add_vector_options(app, a->vectors);
  return [a, &setup] {
    auto vo = to_vector_options(a->vectors);
    if (!vo) return fail(vo.status());
    TwinOptions o;
    o.vectors = *vo;
    o.threshold = a->threshold;
    o.shingle = a->shingle;
    o.top_terms = a->top_terms;
    o.bands = a->bands;
    o.rows = a->rows;
    o.seed = a->seed;
    if (!a->quiet && stderr_is_tty())
      o.progress = [](std::size_t done, std::size_t total) {
        std::fprintf(stderr, "\rsignatures %zu/%zu", done, total);
        if (done == total) std::fprintf(stderr, "\n");
      };
    auto reader = open_reader(setup);
    if (!reader) return int{kExitError};
    auto r = find_twins(*reader, o);
    if (!r) return fail(r.status());
    if (a->json) {
      std::cout << dump_json(twins_json(*r, o), 2) << "\n";
      return int{kExitOk};
    }
    for (std::size_t i = 0; i < r->groups.size(); ++i) {
      const TwinGroup& g = r->groups[i];
      std::printf("group %zu: %zu documents, similarity %.4f", i + 1, g.docs.size(), g.min_similarity);
      if (g.max_similarity > g.min_similarity) std::printf(" to %.4f", g.max_similarity);
      std::printf("\n");
      for (auto& id : g.external_ids) std::printf("  %s\n", id.c_str());
    }
    std::printf("%zu groups among %zu documents (%zu candidate pairs, %zu at or above %.2f)\n", r->groups.size(),
                r->documents, r->candidate_pairs, r->verified_pairs, o.threshold);
    return int{kExitOk};
  };
}

}  // namespace lode::cli
