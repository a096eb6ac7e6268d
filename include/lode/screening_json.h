// lode/screening_json.h — the JSON shapes of sifts, shared by `lode sift
// --json` and the HTTP API (docs/screening.md documents every field).
// Schemas: lode.sift/1 (a sift's state), lode.sift-batch/1 (a batch to
// judge), lode.sift-list/1; fields are only ever added within a version.
//
// Thread safety: pure functions, except batch_json, which reads titles
// through the given reader (one thread, active read scope).
#pragma once

#include <nlohmann/json.hpp>

#include "lode/screening.h"

namespace lode {

inline constexpr const char* kSiftSchema = "lode.sift/1";
inline constexpr const char* kSiftBatchSchema = "lode.sift-batch/1";
inline constexpr const char* kSiftListSchema = "lode.sift-list/1";

// with_judgments adds "judgments": every latest judgment.
nlohmann::json sift_json(const SiftState& s, bool with_judgments);
// Each proposed document with its title and current judgment (null if none).
Result<nlohmann::json> batch_json(IndexReader& reader, const std::string& sift, const SiftBatch& b,
                                  const SiftState& state);
nlohmann::json sift_list_json(const std::vector<SiftSummary>& sifts);

}  // namespace lode
