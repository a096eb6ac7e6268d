// lode/present.h — the JSON shapes lode prints and serves (schema "lode.search/1").
//
// One place builds them so the CLI's --json and the HTTP API agree field for
// field. docs/json-output.md documents every field.
//
// Thread safety: pure functions.
#pragma once

#include <nlohmann/json.hpp>

#include "lode/index.h"
#include "lode/ranking.h"

namespace lode {

inline constexpr const char* kSearchSchema = "lode.search/1";
inline constexpr const char* kStatsSchema = "lode.stats/1";

// The model and its parameters as used ("name", "k1"/"b" or "weighting", "field_weights").
nlohmann::json model_json(const SearchOptions& options);
nlohmann::json hit_json(const Hit& hit, std::size_t rank, bool with_breakdown);
nlohmann::json results_json(std::string_view query, const SearchResults& results, const SearchOptions& options);
nlohmann::json stats_json(const CollectionStats& stats, const IndexSettings& settings, std::string_view path);

}  // namespace lode
