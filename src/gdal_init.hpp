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
