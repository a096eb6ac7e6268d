// Queries that run but probably do not say what the user meant get a
// warning naming what was wrong (lode/query.h); nothing is refused.
#include "lode/query.h"
#include "util.h"

using namespace lode;

namespace {

std::vector<std::string> warnings_of(const std::string& text) {
  auto analyzer = Analyzer::create(AnalyzerOptions{});
  REQUIRE(analyzer.ok());
  auto q = parse_query(text, **analyzer);
  REQUIRE_MESSAGE(q.ok(), q.status().to_string());
  return q->warnings;
}

bool any_contains(const std::vector<std::string>& ws, const std::string& part) {
  for (auto& w : ws)
    if (w.find(part) != std::string::npos) return true;
  return false;
}

}  // namespace

TEST_CASE("query warnings: unbalanced quote, unknown field, unknown kind, only excluded words") {
  auto w = warnings_of("\"north quay");
  CHECK(any_contains(w, "unbalanced quote"));
  CHECK(any_contains(w, "\"north quay"));

  w = warnings_of("author:tulloch storm");
  CHECK(any_contains(w, "'author:' is not a field"));
  CHECK(any_contains(w, "@by"));  // points to the filter the user probably meant

  w = warnings_of("storm @kind:pdf,spreadsheet");
  REQUIRE(w.size() == 1);
  CHECK(any_contains(w, "@kind:spreadsheet matches no document"));

  w = warnings_of("-storm");
  CHECK(any_contains(w, "only excluded words"));
  w = warnings_of("-storm -\"north quay\"");
  CHECK(any_contains(w, "only excluded words"));

  // Well-formed queries stay silent.
  for (const std::string ok : {"\"north quay\" +storm -draft", "title:lamp body:\"fog horn\"", "storm @kind:markdown",
                               "10:30 tide", "-draft storm"}) {
    CAPTURE(ok);
    CHECK(warnings_of(ok).empty());
  }
}
