// Parameter sweeps: every cell equals a separate run at that setting, the
// index file is only read, values parse as documented, and the SVG heat map
// holds what a reader needs (cells with values, axis labels, a legend).
#include <filesystem>
#include <regex>

#include "core/util.h"
#include "lode/eval.h"

using namespace lode;
using namespace lode::test;

namespace {

const std::vector<std::pair<std::string, std::string>> kDocs = {
    {"Storm log", "storm surge flooded the north quay and the keeper logged the storm at night"},
    {"Lamp repairs", "the storm broke the lamp glass and the keeper replaced the lamp before dusk"},
    {"Gale warning", "gale warning from the mainland the keeper raised the storm cone"},
    {"Kelp", "kelp harvest on the south skerry after a calm week of fair weather and light wind"},
    {"Seals", "seal pups on the skerry counted by the keeper at low tide"},
    {"Stores", "the lamp glass was cleaned and the paraffin store refilled for winter"},
    {"Slipway", "a surge of spring tide covered the slipway and the quay"},
    {"Damage", "gale and surge damage to the slipway was repaired in march by the mainland crew"},
};
const std::vector<QueryLine> kQueries = {{"q1", "storm keeper"}, {"q2", "surge slipway"}, {"q3", "lamp glass"},
                                         {"q4", "skerry tide"}};
const Qrels kQrels = {{"q1", {{"d1", 2}, {"d3", 1}}},
                      {"q2", {{"d7", 1}, {"d8", 1}}},
                      {"q3", {{"d2", 1}, {"d6", 1}}},
                      {"q4", {{"d5", 1}}}};

}  // namespace

TEST_CASE("sweep: every cell equals its own run / the index is not written / best is the maximum") {
  TempDir dir;
  std::string path = dir.str("sw.sqlite");
  build_index(path, kDocs);
  auto before = std::filesystem::last_write_time(path);
  auto size_before = std::filesystem::file_size(path);
  auto reader = IndexReader::open(path);
  REQUIRE(reader.ok());
  auto searcher = Searcher::create(**reader);
  REQUIRE(searcher.ok());
  std::vector<SweepAxis> axes = {{SweepParam::kK1, {0.5, 1.2, 2.0}},
                                 {SweepParam::kB, {0.0, 0.75}},
                                 {SweepParam::kTitleWeight, {0.0, 2.0}}};
  Metric m{MetricKind::kNdcg, 3};
  std::size_t calls = 0;
  auto res = sweep(**searcher, kQueries, kQrels, SearchOptions{}, axes, m, {}, [&](std::size_t d, std::size_t t) {
    CHECK(d == ++calls);
    CHECK(t == 12);
  });
  REQUIRE(res.ok());
  REQUIRE(res->cells.size() == 12);
  CHECK(calls == 12);
  double best = -1;
  for (auto& c : res->cells) {
    SearchOptions o;
    o.bm25 = {c.setting[0], c.setting[1]};
    o.field_weight[0] = c.setting[2];
    auto r = run_queries(**searcher, kQueries, o);
    REQUIRE(r.ok());
    double mean = 0;
    for (auto& [q, v] : per_query_metric(*r, kQrels, m)) mean += v / 4;
    CHECK(c.value == doctest::Approx(mean).epsilon(1e-12));
    best = std::max(best, c.value);
  }
  CHECK(res->cells[res->best].value == best);
  // Last axis fastest: cell 1 differs from cell 0 in title weight only.
  CHECK(res->cells[1].setting == std::vector<double>{0.5, 0.0, 2.0});
  CHECK(std::filesystem::last_write_time(path) == before);
  CHECK(std::filesystem::file_size(path) == size_before);

  std::string svg = sweep_svg(*res, "test <sweep> & heat map");
  CHECK(svg.rfind("<?xml", 0) == 0);
  CHECK(svg.find("</svg>") != std::string::npos);
  CHECK(svg.find("test &lt;sweep&gt; &amp; heat map") != std::string::npos);  // escaped title
  // One coloured cell per setting, each printing its value to 4 decimals.
  std::regex cell("<rect x=\"[0-9.]+\" y=\"[0-9.]+\" width=\"64\" height=\"30\" fill=\"#[0-9a-f]{6}\"");
  CHECK(std::distance(std::sregex_iterator(svg.begin(), svg.end(), cell), std::sregex_iterator()) == 12);
  for (auto& c : res->cells) {
    char buf[32];
    std::snprintf(buf, sizeof buf, ">%.4f<", c.value);
    CHECK(svg.find(buf) != std::string::npos);
  }
  for (const char* label : {">k1<", ">b<", "title-weight = 0<", "title-weight = 2<", ">ndcg@3<", "stroke=\"#d01c1c\""})
    CHECK_MESSAGE(svg.find(label) != std::string::npos, label);
}

TEST_CASE("sweep values: lists and inclusive ranges / errors name the spec") {
  CHECK(parse_sweep_values("0.9,1.2").value() == std::vector<double>{0.9, 1.2});
  auto r = parse_sweep_values("0:1:0.25");
  REQUIRE(r.ok());
  CHECK(*r == std::vector<double>{0, 0.25, 0.5, 0.75, 1});
  auto tenth = parse_sweep_values("0:1:0.1");
  REQUIRE(tenth.ok());
  CHECK(tenth->size() == 11);
  CHECK((*tenth)[3] == 0.3);  // no accumulated drift
  for (const char* bad : {"", "a,b", "1:0:0.1", "0:1:0", "0:1", "0:1:0.1:2", "1,,2", "0:1e9:1e-9"}) {
    CAPTURE(bad);
    auto e = parse_sweep_values(bad);
    REQUIRE(!e.ok());
    CHECK(e.status().code() == Code::kInvalidArgument);
    CHECK(e.status().message().find(std::string("'") + bad + "'") != std::string::npos);
  }
  TempDir dir;
  build_index(dir.str("e.sqlite"), kDocs);
  auto reader = IndexReader::open(dir.str("e.sqlite"));
  auto searcher = Searcher::create(**reader);
  CHECK(!sweep(**searcher, kQueries, kQrels, {}, {}, {}).ok());
  CHECK(!sweep(**searcher, kQueries, kQrels, {}, {{SweepParam::kB, {}}}, {}).ok());
  CHECK(!sweep(**searcher, kQueries, kQrels, {}, {{SweepParam::kB, {0.5}}, {SweepParam::kB, {0.7}}}, {}).ok());
  auto out_of_range = sweep(**searcher, kQueries, kQrels, {}, {{SweepParam::kB, {1.5}}}, {});
  CHECK(out_of_range.status().code() == Code::kInvalidArgument);
}
