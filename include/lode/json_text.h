// lode/json_text.h — JSON values as the text lode prints and serves.
//
// Every JSON text lode writes (the CLI's --json, the HTTP API) goes through
// dump_json(): strings and object keys pass through escape_name()
// (lode/names.h), so a file name that is not UTF-8 comes out escaped,
// reversibly, instead of being refused (nlohmann::json throws on it) or
// replaced by U+FFFD (an id no one can give back). Text that is UTF-8
// without U+F780 … U+F7FF — everything else lode prints — is unchanged.
//
// Thread safety: a pure function.
#pragma once

#include <nlohmann/json.hpp>
#include <string>

namespace lode {

// `j` as JSON text, `indent` as nlohmann::json::dump (-1: one line).
std::string dump_json(const nlohmann::json& j, int indent = -1);

}  // namespace lode
