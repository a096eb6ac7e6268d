// The writer's batch dictionary against std::map on many keys (growth from
// 1024 cells several times over, tag collisions, keys equal but for field).
#include <map>
#include <string>

#include "common/slot_table.h"
#include "util.h"

using namespace lode;

TEST_CASE("SlotTable finds every inserted (field, term) and nothing else, across growth") {
  SlotTable table;
  std::vector<std::pair<unsigned char, std::string>> keys;
  std::map<std::pair<unsigned char, std::string>, std::uint32_t> want;
  auto find = [&](unsigned char f, const std::string& t) {
    return table.find(SlotTable::hash(f, t), [&](std::uint32_t s) { return keys[s].first == f && keys[s].second == t; });
  };
  for (int i = 0; i < 50000; ++i) {
    for (unsigned char f = 0; f < 2; ++f) {
      std::string t = "t" + std::to_string(i * 7919 % 100003);
      if (want.count({f, t})) continue;
      REQUIRE(find(f, t) == SlotTable::kNone);
      auto slot = static_cast<std::uint32_t>(keys.size());
      keys.emplace_back(f, t);
      table.insert(SlotTable::hash(f, t), slot);
      want[{f, t}] = slot;
    }
  }
  for (auto& [k, slot] : want) CHECK(find(k.first, k.second) == slot);
  CHECK(find(0, "absent") == SlotTable::kNone);
  CHECK(find(2, "t0") == SlotTable::kNone);
  table.clear();
  CHECK(find(0, "t0") == SlotTable::kNone);
}
