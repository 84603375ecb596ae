// The writers format numbers with std::to_chars into their own buffers. C++17 [charconv.to.chars]
// says to_chars with a format and precision writes what printf does with %.*g / %.*f in the "C"
// locale, and the shortest form reads back to the same value; both checked here against the C
// library's printf and strtod/strtof (glibc, an outside reference), over values of every
// magnitude, rounding ties and the edges the outputs meet (zero, negative zero, infinities).
#include <gtest/gtest.h>

#include <cfloat>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <random>
#include <string>
#include <vector>

#include "envsift/write/value_format.hpp"

namespace envsift {
namespace {

std::string printf_as(const char* format, double v) {
  char buf[512];
  std::snprintf(buf, sizeof buf, format, v);
  return buf;
}

std::vector<double> awkward_values() {
  std::vector<double> v{0.0, -0.0, 1.0, -1.0, 0.5, 0.0005, 0.0015, 0.0025, 1234565.0, 999999.5, 9999995.0,
                        1e-300, 1e300, DBL_MAX, DBL_MIN, 4.9e-324, INFINITY, -INFINITY, 2.5, 1.0005, 123.4565};
  std::mt19937_64 rng(20261203);
  std::uniform_real_distribution<double> mantissa(-10, 10);
  std::uniform_int_distribution<int> exponent(-40, 40);
  for (int i = 0; i < 200000; ++i) v.push_back(mantissa(rng) * std::pow(10.0, exponent(rng)));
  for (int i = 0; i < 20000; ++i) v.push_back(std::round(mantissa(rng) * 1e6) / 2e3 + 0.0005);  // near %.3f ties
  return v;
}

TEST(NumberFormat, StatisticsAreExactlyPrintfsSixSignificantDigits) {
  for (double v : awkward_values()) ASSERT_EQ(format_statistic(v), printf_as("%.6g", v)) << v;
  EXPECT_EQ(format_statistic(NAN), "");
}

TEST(NumberFormat, ScoresAreExactlyPrintfsThreeDecimals) {
  for (double v : awkward_values()) ASSERT_EQ(format_score(v), printf_as("%.3f", v)) << v;
}

TEST(NumberFormat, ValuesReadBackToTheSameNumber) {
  for (double v : awkward_values()) {
    if (!std::isfinite(v)) continue;
    const std::string d = format_value(v), f = format_value(v, true);
    ASSERT_EQ(std::strtod(d.c_str(), nullptr), v) << d;
    ASSERT_EQ(std::strtof(f.c_str(), nullptr), static_cast<float>(v)) << f;
  }
  EXPECT_EQ(format_value(NAN), "");
  EXPECT_EQ(format_value(0.1, true), "0.1");   // the float nearest 0.1, not 0.10000000149011612
  EXPECT_EQ(format_value(0.1), "0.1");
}

TEST(NumberFormat, BufferFormsWriteWhatTheStringFormsReturn) {
  char buf[kNumberChars];
  for (double v : std::vector<double>{DBL_MAX, -DBL_MAX, 3.14159, NAN}) {
    EXPECT_EQ(std::string(buf, put_score(buf, v)), format_score(v));
    EXPECT_EQ(std::string(buf, put_statistic(buf, v)), format_statistic(v));
    EXPECT_EQ(std::string(buf, put_value(buf, v)), format_value(v));
  }
}

}  // namespace
}  // namespace envsift
