// Shared pieces of the explore tests: a small invented corpus, an index
// opened for reading, and the outside reference scripts run with
// /usr/bin/python3 (Debian python3-sklearn, python3-scipy).
#pragma once

#include <nlohmann/json.hpp>

#include "core/util.h"

namespace lode::test {

// Invented harbour notes: lowercase words of 2+ letters, so scikit-learn's
// default token pattern and lode's analyzer (language none, no stopwords)
// give the same tokens.
inline const std::vector<std::string> kHarbourNotes = {
    "the keeper logged the storm and the storm surge at the north quay",
    "kelp beds recovered after the storm winter",
    "seals hauled out on the north skerry at low tide",
    "the lamp burned paraffin until the generator was installed",
    "generator generator generator maintenance log for the winter",
    "tide tables tide gauge readings and one storm warning",
    "seal pups counted on the skerry by the keeper",
    "one winter of gales kelp washed ashore on the quay",
    "the quay the quay the quay",
};

inline std::vector<std::pair<std::string, std::string>> bodies(const std::vector<std::string>& texts) {
  std::vector<std::pair<std::string, std::string>> out;
  for (auto& t : texts) out.push_back({"", t});
  return out;
}

// Builds `dir`/`name` from `docs` (ids d1, d2, ...) and opens it.
inline std::unique_ptr<IndexReader> open_built(const TempDir& dir, const std::string& name,
                                               const std::vector<std::pair<std::string, std::string>>& docs,
                                               const AnalyzerOptions& analyzer = {}) {
  std::string path = dir.str(name);
  build_index(path, docs, analyzer);
  auto reader = IndexReader::open(path);
  REQUIRE_MESSAGE(reader.ok(), reader.status().to_string());
  return std::move(reader.value());
}

inline const AnalyzerOptions kPlainWords{"none", false};

// Runs `script` (a path under the source tree) on `input` written to `dir`.
inline nlohmann::json python_reference(const std::string& script, const TempDir& dir, const nlohmann::json& input) {
  write_file(dir.path() / "reference-in.json", input.dump());
  int rc = 0;
  std::string out = run("/usr/bin/python3 " LODE_SOURCE_DIR "/" + script + " " + dir.str("reference-in.json") +
                            " 2>&1", &rc);
  REQUIRE_MESSAGE(rc == 0, script << " failed (install python3-sklearn python3-scipy): " << out);
  return nlohmann::json::parse(out);
}

}  // namespace lode::test
