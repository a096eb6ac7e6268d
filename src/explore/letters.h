// Checks of SMART tf / idf letters and log base (private to src/explore):
// the vectors and the matrix accept the same letters as ranking.h.
#pragma once

#include <string>
#include <string_view>

#include "lode/status.h"

namespace lode::explore {

// InvalidArgument naming `what` ("vector", "matrix") and the bad value.
inline Status check_letters(char tf, char idf, double log_base, const std::string& what) {
  if (std::string_view("nlabLr").find(tf) == std::string_view::npos)
    return Status::InvalidArgument(what + " tf letter '" + std::string(1, tf) + "' (use one of n l a b L r)");
  if (std::string_view("ntps").find(idf) == std::string_view::npos)
    return Status::InvalidArgument(what + " idf letter '" + std::string(1, idf) + "' (use one of n t p s)");
  if (!(log_base > 1)) return Status::InvalidArgument("log base must be greater than 1");
  return Status();
}

}  // namespace lode::explore
