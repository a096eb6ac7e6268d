// dump_json(): JSON text with names escaped (include/lode/json_text.h).
#include "lode/json_text.h"

#include "lode/names.h"

namespace lode {
namespace {

bool needs_escape(const nlohmann::json& j) {
  if (j.is_string()) return name_needs_escape(j.get_ref<const std::string&>());
  if (j.is_object()) {
    for (const auto& [key, value] : j.items())
      if (name_needs_escape(key) || needs_escape(value)) return true;
    return false;
  }
  if (j.is_array()) {
    for (const auto& value : j)
      if (needs_escape(value)) return true;
  }
  return false;
}

nlohmann::json escaped(const nlohmann::json& j) {
  if (j.is_string()) return escape_name(j.get_ref<const std::string&>());
  if (j.is_object()) {
    nlohmann::json out = nlohmann::json::object();
    for (const auto& [key, value] : j.items()) out[escape_name(key)] = escaped(value);
    return out;
  }
  if (j.is_array()) {
    nlohmann::json out = nlohmann::json::array();
    for (const auto& value : j) out.push_back(escaped(value));
    return out;
  }
  return j;
}

}  // namespace

std::string dump_json(const nlohmann::json& j, int indent) {
  // The common case, nothing to escape, costs one walk and no copy.
  return needs_escape(j) ? escaped(j).dump(indent) : j.dump(indent);
}

}  // namespace lode
