// The knee rule and the check-sample recall estimate (lode/screening.h).
#include <algorithm>
#include <cmath>

#include "lode/screening.h"

namespace lode {

KneeVerdict knee_check(const std::vector<bool>& relevant, const KneeOptions& options) {
  KneeVerdict v;
  v.reviewed = relevant.size();
  for (bool r : relevant) v.found += r ? 1 : 0;
  v.needed = options.ratio_base - static_cast<double>(std::min(v.found, options.found_cap));
  if (v.found == 0 || v.reviewed == 0) return v;
  // The knee: the point of the gain curve farthest from the chord (0,0)-(x_n,y_n).
  // The signed distance is proportional to x_n*y - y_n*x (positive above the
  // chord, where a gain curve bends), so its largest value marks the knee.
  const double xn = static_cast<double>(v.reviewed), yn = static_cast<double>(v.found);
  double best = -1;
  std::size_t found = 0;
  for (std::size_t i = 0; i < relevant.size(); ++i) {
    found += relevant[i] ? 1 : 0;
    double x = static_cast<double>(i + 1), y = static_cast<double>(found);
    double d = xn * y - yn * x;
    if (d > best) {
      best = d;
      v.knee_reviewed = i + 1;
      v.knee_found = found;
    }
  }
  if (v.knee_reviewed >= v.reviewed) return v;  // no flat stretch after the knee yet
  double before = static_cast<double>(v.knee_found) / static_cast<double>(v.knee_reviewed);
  double after = static_cast<double>(v.found - v.knee_found + 1) / static_cast<double>(v.reviewed - v.knee_reviewed);
  v.slope_ratio = before / after;
  v.stop = v.reviewed >= options.min_reviewed && v.slope_ratio >= v.needed;
  return v;
}

std::pair<double, double> wilson_interval(std::size_t k, std::size_t n, double z) {
  if (n == 0) return {0, 1};
  double nn = static_cast<double>(n), p = static_cast<double>(k) / nn, z2 = z * z;
  double centre = (p + z2 / (2 * nn)) / (1 + z2 / nn);
  double half = z / (1 + z2 / nn) * std::sqrt(p * (1 - p) / nn + z2 / (4 * nn * nn));
  return {std::max(0.0, centre - half), std::min(1.0, centre + half)};
}

RecallEstimate estimate_recall(std::size_t found_then, std::size_t found_now, std::size_t remainder,
                               std::size_t sample, std::size_t sample_relevant) {
  RecallEstimate e;
  e.sample = sample;
  e.sample_relevant = sample_relevant;
  e.remainder = remainder;
  if (sample == 0) return e;
  e.known = true;
  double p = static_cast<double>(sample_relevant) / static_cast<double>(sample);
  auto [lo, hi] = wilson_interval(sample_relevant, sample);
  double f0 = static_cast<double>(found_then), f = static_cast<double>(found_now), u = static_cast<double>(remainder);
  auto recall = [&](double q) {
    double total = f0 + q * u;
    return total <= 0 ? 1.0 : std::min(1.0, f / total);
  };
  e.value = recall(p);
  e.low = recall(hi);   // more relevant documents left -> lower recall
  e.high = recall(lo);
  return e;
}

}  // namespace lode
