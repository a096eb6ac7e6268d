// An invented archive for the sift tests: keeper's notes of a lighthouse and
// tide station. Documents 1..kFogNotes are about the fog signal (relevant to
// "fog signal" reviews); the rest are about tides, seals, supplies and
// weather, sharing some words with them.
#pragma once

#include <random>
#include <string>
#include <utility>
#include <vector>

#include "core/util.h"

namespace lode::test {

inline constexpr std::size_t kFogNotes = 12;
inline constexpr std::size_t kOtherNotes = 48;

inline std::vector<std::pair<std::string, std::string>> keeper_notes() {
  const std::vector<std::string> fog = {"fog", "horn", "signal", "diaphragm", "compressor", "blast", "visibility",
                                        "sounded", "foghorn", "air"};
  const std::vector<std::string> other = {"tide", "gauge", "seal", "pups", "paraffin", "supply", "boat",
                                          "kelp", "gale", "barometer", "quay", "skerry", "lamp", "lens",
                                          "rainfall", "logbook", "keeper", "winter", "north", "ledger"};
  const std::vector<std::string> shared = {"keeper", "night", "morning", "station", "log", "weather"};
  std::mt19937 rng(7);
  auto pick = [&](const std::vector<std::string>& v) { return v[rng() % v.size()]; };
  std::vector<std::pair<std::string, std::string>> docs;
  for (std::size_t i = 0; i < kFogNotes + kOtherNotes; ++i) {
    bool is_fog = i < kFogNotes;
    std::string body;
    for (int w = 0; w < 40; ++w) {
      auto r = static_cast<unsigned>(rng() % 10);
      const auto& src = r < 5 ? (is_fog ? fog : other) : r < 8 ? other : shared;
      body += (body.empty() ? "" : " ") + pick(src);
    }
    docs.emplace_back("note " + std::to_string(i + 1), body);
  }
  return docs;
}

}  // namespace lode::test
