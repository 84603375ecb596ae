#include "envsift/evaluate/injected_errors.hpp"

#include <algorithm>
#include <cmath>
#include <utility>

namespace envsift {

void inject_errors(std::vector<VirtualRecord>& records, const StudyArea& area, double share, SeededRandom& random) {
  const std::size_t n = records.size();
  if (n < 2) return;
  const auto count = std::clamp<std::size_t>(static_cast<std::size_t>(std::lround(share * static_cast<double>(n))), 1, n - 1);
  std::vector<std::size_t> order(n);
  for (std::size_t i = 0; i < n; ++i) order[i] = i;
  for (std::size_t i = 0; i < count; ++i) std::swap(order[i], order[i + random.below(n - i)]);  // partial shuffle
  static const char* kinds[] = {"relocated", "swapped", "longitude_sign", "latitude_sign", "decimal_shift"};
  for (std::size_t k = 0; k < count; ++k) {
    VirtualRecord& r = records[order[k]];
    r.error = kinds[random.below(5)];
    if (r.error == "relocated") {
      const std::size_t cell = random.below(area.longitude.size());
      r.longitude = area.longitude[cell], r.latitude = area.latitude[cell];
    } else if (r.error == "swapped") {
      std::swap(r.longitude, r.latitude);
    } else if (r.error == "longitude_sign") {
      r.longitude = -r.longitude;
    } else if (r.error == "latitude_sign") {
      r.latitude = -r.latitude;
    } else {
      (random.below(2) ? r.longitude : r.latitude) /= 10;
    }
  }
}

void inject_batch(std::vector<VirtualRecord>& records, const StudyArea& area, double share, std::size_t places,
                  SeededRandom& random) {
  std::vector<std::size_t> clean;
  for (std::size_t i = 0; i < records.size(); ++i)
    if (records[i].error.empty()) clean.push_back(i);
  if (clean.size() < 2 || places == 0) return;
  const auto count = std::clamp<std::size_t>(static_cast<std::size_t>(std::lround(share * static_cast<double>(records.size()))), 1,
                                             clean.size() / 2);
  for (std::size_t i = 0; i < count; ++i) std::swap(clean[i], clean[i + random.below(clean.size() - i)]);
  std::vector<std::size_t> cells;
  for (std::size_t k = 0; k < places; ++k) cells.push_back(random.below(area.longitude.size()));
  for (std::size_t k = 0; k < count; ++k) {
    VirtualRecord& r = records[clean[k]];
    r.error = "batch";
    r.longitude = area.longitude[cells[k % places]], r.latitude = area.latitude[cells[k % places]];
  }
}

}  // namespace envsift
