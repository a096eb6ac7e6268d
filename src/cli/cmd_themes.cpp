// `lode themes`: topic groups of the index by spherical k-means.
#include <cstdio>
#include <iostream>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/explore_options.h"
#include "lode/explore_json.h"
#include "lode/json_text.h"

namespace lode::cli {

Runner add_themes_command(CLI::App& app, const Setup& setup) {
  struct Args {
    ThemeOptions o;
    bool json = false;
    VectorArgs vectors;
  };
  auto a = std::make_shared<Args>();
  app.add_option("-k,--groups", a->o.k, "number of groups; 0 = suggest by silhouette (default 0)");
  app.add_option("--max-k", a->o.max_k, "largest number of groups tried when suggesting (default 12)");
  app.add_option("--seed", a->o.seed, "seed of the k-means++ start (default 1)");
  app.add_option("--min-df", a->o.min_df, "ignore terms in fewer documents (default 2)");
  app.add_option("--terms", a->o.top_terms, "top terms per group (default 8)");
  app.add_option("--docs", a->o.top_documents, "most central documents per group (default 3)");
  app.add_option("--max-docs", a->o.max_documents, "group a seeded sample above this many documents (default 200000)");
  app.add_flag("--json", a->json, "print as JSON (schema lode.themes/1)");
  add_vector_options(app, a->vectors);
  return [a, &setup] {
    auto vo = to_vector_options(a->vectors);
    if (!vo) return fail(vo.status());
    ThemeOptions o = a->o;
    o.vectors = *vo;
    auto reader = open_reader(setup);
    if (!reader) return int{kExitError};
    auto r = find_themes(*reader, o);
    if (!r) return fail(r.status());
    if (a->json) {
      std::cout << dump_json(themes_json(*r, o), 2) << "\n";
      return int{kExitOk};
    }
    if (r->k_suggested) {
      std::printf("k = %zu, suggested by mean silhouette:", r->k);
      for (auto& [k, s] : r->silhouettes) std::printf(" %zu:%.3f", k, s);
      std::printf("\n");
    }
    for (std::size_t i = 0; i < r->themes.size(); ++i) {
      const Theme& t = r->themes[i];
      std::printf("\ngroup %zu: %zu documents, cohesion %.3f\n  terms:", i + 1, t.size, t.cohesion);
      for (auto& w : t.terms) std::printf(" %s", w.word.c_str());
      std::printf("\n");
      for (auto& c : t.central) std::printf("  %.3f  %s\n", c.similarity, c.external_id.c_str());
    }
    std::printf("\n%zu documents%s, objective %.4f after %zu iterations%s\n", r->documents,
                r->sampled ? " (a seeded sample)" : "", r->objective, r->iterations,
                r->converged ? "" : " (not converged)");
    return int{kExitOk};
  };
}

}  // namespace lode::cli
