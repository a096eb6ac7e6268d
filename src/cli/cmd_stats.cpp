// `lode stats`: what the index holds and how it analyzes text.
#include <cstdio>
#include <iostream>

#include "cli/commands.h"
#include "cli/common.h"
#include "lode/json_text.h"
#include "lode/present.h"

namespace lode::cli {

Runner add_stats_command(CLI::App& app, const Setup& setup) {
  auto json = std::make_shared<bool>(false);
  app.add_flag("--json", *json, "print as JSON (schema lode.stats/1)");
  return [json, &setup] {
    std::string path = resolve_index(setup);
    auto reader = IndexReader::open(path);
    if (!reader) return fail(reader.status());
    auto scope = (*reader)->begin();
    if (!scope) return fail(scope.status());
    CollectionStats s = (*reader)->stats();
    const IndexSettings& set = (*reader)->settings();
    if (*json) {
      std::cout << dump_json(stats_json(s, set, path), 2) << "\n";
      return int{kExitOk};
    }
    auto u = [](std::uint64_t v) { return static_cast<unsigned long long>(v); };
    std::printf("index          %s (format %d)\n", path.c_str(), kIndexFormatVersion);
    std::printf("documents      %llu live, %llu replaced or deleted\n", u(s.documents), u(s.dead_documents));
    std::printf("files          %llu\n", u(s.files));
    std::printf("terms          %llu (field, term) pairs\n", u(s.terms));
    std::printf("postings       %llu\n", u(s.postings));
    std::printf("avg length     title %.2f, body %.2f terms\n", s.average_length(Field::kTitle),
                s.average_length(Field::kBody));
    std::printf("size on disk   %.2f MB\n", static_cast<double>(s.bytes_on_disk) / 1e6);
    std::printf("analyzer       language %s, stopwords %s\n", set.analyzer.language.c_str(),
                set.analyzer.stopwords ? "removed" : "kept");
    return int{kExitOk};
  };
}

}  // namespace lode::cli
