// SiftOptions <-> the JSON kept in sift.options, so a sift keeps the method
// settings it started with.
#pragma once

#include <nlohmann/json.hpp>

#include "lode/screening.h"

namespace lode::screening {

nlohmann::json options_to_json(const SiftOptions& o);
// Missing keys keep their defaults; a wrong type is Corruption naming the key.
Result<SiftOptions> options_from_json(const nlohmann::json& j);

}  // namespace lode::screening
