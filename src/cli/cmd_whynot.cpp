// `lode whynot QUERY DOC`: where a document ranks and why not higher.
#include <iostream>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/explore_options.h"
#include "cli/model_options.h"
#include "lode/inspect.h"
#include "lode/json_text.h"

namespace lode::cli {
namespace {

struct WhyNotArgs {
  std::string query, doc;
  ModelArgs model;
  WhyNotOptions w;
  bool json = false;
};

void print_breakdown(const char* label, const nlohmann::json& hit) {
  std::printf("%s %-20s score %.4f\n", label, hit["doc"].get<std::string>().c_str(), hit["score"].get<double>());
  for (auto& t : hit["breakdown"])
    std::printf("      %-6s %-18s tf %-3u %.4f\n", t["field"].get<std::string>().c_str(),
                t["term"].get<std::string>().c_str(), t["tf"].get<unsigned>(), t["contribution"].get<double>());
}

void print(const nlohmann::json& j) {
  std::string doc = j["doc"];
  if (!j["rank"].is_null())
    std::printf("%s ranks %zu of %llu matching documents\n", doc.c_str(), j["rank"].get<std::size_t>(),
                j["matched"].get<unsigned long long>());
  else if (j["matches"].get<bool>())
    std::printf("%s matches but ranks below %zu\n", doc.c_str(), j["searched_to"].get<std::size_t>());
  else
    std::printf("%s is not retrieved by this query\n", doc.c_str());
  for (auto& w : j["words"]) {
    std::string where = w["in_title"].get<bool>() && w["in_body"].get<bool>() ? "title and body"
                        : w["in_title"].get<bool>()                          ? "title"
                        : w["in_body"].get<bool>()                           ? "body"
                                                                             : "";
    std::string t = w["term"];
    if (!w["in_index"].get<bool>()) std::printf("  word %-16s lacking (no document in the index has it)\n", t.c_str());
    else if (w["lacking"].get<bool>()) std::printf("  word %-16s lacking%s\n", t.c_str(), where.empty() ? "" : (" where asked (has it in " + where + ")").c_str());
    else std::printf("  word %-16s present in %s\n", t.c_str(), where.c_str());
  }
  for (auto& d : j["dropped"]) std::printf("  note: %s\n", d.get<std::string>().c_str());
  for (auto& c : j["clauses"])
    std::printf("  %-8s %-20s %s: %s\n", c["kind"].get<std::string>().c_str(), c["text"].get<std::string>().c_str(),
                c["holds"].get<bool>() ? "holds" : "REMOVES IT", c["why"].get<std::string>().c_str());
  print_breakdown("  this ", j["hit"]);
  if (!j["kth"].is_null()) print_breakdown(("  #" + std::to_string(j["k"].get<std::size_t>()) + "  ").c_str(), j["kth"]);
  else std::printf("  fewer than %zu documents match\n", j["k"].get<std::size_t>());
}

}  // namespace

Runner add_whynot_command(CLI::App& app, const Setup& setup) {
  auto a = std::make_shared<WhyNotArgs>();
  app.add_option("query", a->query, "the query")->required();
  app.add_option("doc", a->doc, "document id as search prints it, or #N")->required();
  app.add_option("--k", a->w.k, "compare with the hit at this rank (default 10)")->check(CLI::Range(1, 100000));
  app.add_option("--max-rank", a->w.max_rank, "deepest rank looked for (default 10000)")->check(CLI::Range(1, 10000000));
  app.add_flag("--json", a->json, "print as JSON (schema lode.whynot/1)");
  apply_config(a->model, setup.config);
  add_model_options(app, a->model);
  return [a, &setup] {
    auto options = to_search_options(a->model);
    if (!options) return fail(options.status());
    auto reader = open_reader(setup);
    if (!reader) return int{kExitError};
    std::optional<DocId> doc = named_document(*reader, a->doc);  // opens its own read scope
    if (!doc) return int{kExitError};
    auto searcher = Searcher::create(*reader);
    if (!searcher) return fail(searcher.status());
    auto w = why_not(**searcher, *reader, a->query, *doc, *options, a->w);
    if (!w) return fail(w.status());
    auto j = why_not_json(a->query, *w, *options, a->w);
    if (a->json) std::cout << dump_json(j, 2) << "\n";
    else print(j);
    return int{kExitOk};
  };
}

}  // namespace lode::cli
