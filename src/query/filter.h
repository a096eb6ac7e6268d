// Metadata filter items of the query syntax (@kind:, @in:, @since:, @until:,
// @by:, @pages:), private to src/query/.
#pragma once

#include <string_view>

#include "lode/index.h"
#include "lode/status.h"

namespace lode::query {

// Adds the filter `item` ("@kind:pdf") to `filter`. Returns false when the
// item is not a filter (does not start with '@' followed by a letter), true
// when applied; InvalidArgument naming the item for an unknown name or a bad value.
Result<bool> apply_filter_item(std::string_view item, DocFilter& filter);

}  // namespace lode::query
