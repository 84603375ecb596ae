// GDAL drivers are registered once per process, on first use.
#pragma once
#include <gdal_priv.h>
#include <mutex>

namespace envsift {
inline void ensure_gdal_registered() {
  static std::once_flag once;
  std::call_once(once, [] { GDALAllRegister(); });
}
}  // namespace envsift

namespace envsift {
// While alive, GDAL errors on this thread are silent (for reads whose failure is handled).
struct QuietGdalErrors {
  QuietGdalErrors() { CPLPushErrorHandler(CPLQuietErrorHandler); }
  ~QuietGdalErrors() { CPLPopErrorHandler(); }
  QuietGdalErrors(const QuietGdalErrors&) = delete;
  QuietGdalErrors& operator=(const QuietGdalErrors&) = delete;
};
}  // namespace envsift
