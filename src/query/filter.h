// Metadata filter items of the query syntax (@kind:, @in:, @since:, @until:,
// @by:, @pages:), private to src/query/.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "lode/index.h"
#include "lode/status.h"

namespace lode::query {

// The filter names, for messages.
inline constexpr const char* kFilterNames = "@kind @in @since @until @by @pages";

// Adds the filter `item` ("@kind:pdf") to `filter`. Returns false when the
// item is not a filter (does not start with '@' followed by a letter), true
// when applied; InvalidArgument naming the item for an unknown name or a bad
// value. A @kind value no reader produces is kept (it matches nothing) and
// adds a warning to `warnings`.
Result<bool> apply_filter_item(std::string_view item, DocFilter& filter, std::vector<std::string>& warnings);

}  // namespace lode::query
