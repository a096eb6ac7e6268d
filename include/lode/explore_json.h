// lode/explore_json.h — the JSON shapes of the explore features, shared by
// the CLI's --json and the HTTP API (docs/explore.md documents every field).
// Schemas: lode.nearest/1, lode.keyterms/1, lode.twins/1, lode.themes/1,
// lode.matrix/1; fields are only ever added within a version.
//
// Thread safety: pure functions.
#pragma once

#include <nlohmann/json.hpp>
#include <string_view>

#include "lode/keyterms.h"
#include "lode/matrix.h"
#include "lode/similar.h"
#include "lode/themes.h"
#include "lode/twins.h"

namespace lode {

inline constexpr const char* kNearestSchema = "lode.nearest/1";
inline constexpr const char* kKeyTermsSchema = "lode.keyterms/1";
inline constexpr const char* kTwinsSchema = "lode.twins/1";
inline constexpr const char* kThemesSchema = "lode.themes/1";
inline constexpr const char* kMatrixSchema = "lode.matrix/1";

// The vector weighting as used: {"tf", "idf", "log_base", "field_weights"}.
nlohmann::json vectors_json(const VectorOptions& o);
// `source` = {"doc": id} or {"text": passage}, as the caller describes it.
nlohmann::json nearest_json(const nlohmann::json& source, const SimilarResults& r, const SimilarOptions& o);
nlohmann::json keyterms_json(const nlohmann::json& source, const KeyTermResults& r, const KeyTermOptions& o);
nlohmann::json twins_json(const TwinReport& r, const TwinOptions& o);
nlohmann::json themes_json(const ThemeReport& r, const ThemeOptions& o);
nlohmann::json matrix_json(const MatrixSummary& s, const MatrixFiles& f, const MatrixOptions& o);

}  // namespace lode
