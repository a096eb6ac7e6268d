// A query error is the same error, with the same exit code, whether the
// query is given alone or inside a --batch file read as query syntax (batch
// files are read as plain text unless --query-syntax says otherwise).
#include <doctest/doctest.h>

#include "harness.h"

using namespace lode::testing;

TEST_CASE("a query error inside --batch exits 2, as the same query alone does") {
  Scratch s;
  s.write("log.txt", "the storm took the north quay lamp\n");
  index_tree(s.index(), {s.tree()});
  const std::string at = "--index '" + s.index() + "' ";
  int alone = -1, batched = -1;
  const std::string one = lode_run(at + "search 'storm @author:tulloch'", &alone);
  { std::ofstream(s.other("queries.tsv")) << "q1\tstorm\nq2\tstorm @author:tulloch\n"; }
  const std::string many = lode_run(at + "search --query-syntax --batch '" + s.other("queries.tsv") + "'", &batched);
  CHECK_MESSAGE(alone == 2, one);
  CHECK_MESSAGE(batched == alone, many);
  CHECK(many.find("query q2") != std::string::npos);
  CHECK(many.find("@author:tulloch") != std::string::npos);
}
