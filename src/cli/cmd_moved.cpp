// `lode moved QUERY --before "SETTING" [model options]`: one query under two
// model settings, side by side.
#include <iostream>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/explore_options.h"
#include "cli/model_options.h"
#include "lode/inspect.h"
#include "lode/json_text.h"

namespace lode::cli {
namespace {

struct MovedArgs {
  std::string query, before;
  ModelArgs after;
  MovedOptions o;
  bool json = false;
};

// A setting written as `lode search` options, e.g. "--k1 2 --b 0.5".
Result<SearchOptions> parse_setting(const std::string& text) {
  CLI::App app{"setting"};
  ModelArgs m;
  add_model_options(app, m);
  try {
    app.parse(text, false);
  } catch (const CLI::ParseError& e) {
    return Status::InvalidArgument("--before '" + text + "': " + e.what());
  }
  return to_search_options(m);
}

std::string rank_text(const nlohmann::json& r) { return r.is_null() ? "—" : std::to_string(r.get<std::size_t>()); }

void print(const nlohmann::json& j) {
  auto& c = j["counts"];
  std::printf("top %zu: %zu entered, %zu left, %zu up, %zu down, %zu same\n", j["depth"].get<std::size_t>(),
              c["entered"].get<std::size_t>(), c["left"].get<std::size_t>(), c["up"].get<std::size_t>(),
              c["down"].get<std::size_t>(), c["same"].get<std::size_t>());
  std::printf("%6s %6s  %-8s %-22s %9s %9s\n", "before", "after", "change", "doc", "score was", "score now");
  for (auto& d : j["docs"]) {
    std::printf("%6s %6s  %-8s %-22s %9.4f %9.4f\n", rank_text(d["rank_before"]).c_str(),
                rank_text(d["rank_after"]).c_str(), d["change"].get<std::string>().c_str(),
                d["doc"].get<std::string>().c_str(), d["score_before"].get<double>(), d["score_after"].get<double>());
    int shown = 0;
    for (auto& s : d["shifts"]) {
      if (shown++ == 4) break;
      std::printf("%24s %s:%-16s %+.4f (%.4f -> %.4f)\n", "", s["field"].get<std::string>().c_str(),
                  s["term"].get<std::string>().c_str(), s["after"].get<double>() - s["before"].get<double>(),
                  s["before"].get<double>(), s["after"].get<double>());
    }
  }
}

}  // namespace

Runner add_moved_command(CLI::App& app, const Setup& setup) {
  auto a = std::make_shared<MovedArgs>();
  app.add_option("query", a->query, "the query")->required();
  app.add_option("--before", a->before,
                 "the first setting, as search options in one string (default: the defaults), e.g. \"--k1 2\"");
  app.add_option("--depth", a->o.depth, "ranks compared (default 10)")->check(CLI::Range(1, 1000));
  app.add_flag("--json", a->json, "print as JSON (schema lode.moved/1)");
  add_model_options(app, a->after);  // the second setting
  return [a, &setup] {
    auto before = parse_setting(a->before);
    if (!before) return fail(before.status());
    auto after = to_search_options(a->after);
    if (!after) return fail(after.status());
    auto reader = open_reader(setup);
    if (!reader) return int{kExitError};
    auto searcher = Searcher::create(*reader);
    if (!searcher) return fail(searcher.status());
    auto m = what_moved(**searcher, a->query, *before, *after, a->o);
    if (!m) return fail(m.status());
    auto j = moved_json(a->query, *m, *before, *after, a->o);
    if (a->json) std::cout << dump_json(j, 2) << "\n";
    else print(j);
    return int{kExitOk};
  };
}

}  // namespace lode::cli
