// libFuzzer target for the point reader: delimited-text parsing (quotes, delimiters, BOM,
// encodings), column lookup, coordinate parsing (decimal, DMS, hemispheres, decimal commas) and
// reported elevations. Built and run by scripts/fuzz. Any crash, sanitizer report or exception
// other than a clean InputError is a bug.
#include <cstddef>
#include <cstdint>
#include <sstream>
#include <string>

#include "envsift/errors.hpp"
#include "envsift/read/coordinates.hpp"
#include "envsift/read/elevation_text.hpp"
#include "envsift/read/point_reader.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  envsift::ReaderOptions named, standard;
  for (auto* options : {&named, &standard}) {
    options->columns.longitude = "lon";  // short names, so the fuzzer finds them quickly
    options->columns.latitude = "lat";
  }
  named.columns.id = "id";  // named columns must exist; the standard ones are optional
  named.columns.uncertainty = "u";
  for (const auto* name : {"input.csv", "input.tsv"})
   for (const auto* options_in_use : {&named, &standard}) {
    const envsift::ReaderOptions& options = *options_in_use;
    std::istringstream in(text);
    try {
      const envsift::PointTable t = envsift::read_points_from_text(in, name, options);
      for (std::size_t i = 0; i < t.records.size(); ++i) {
        const auto fields = t.fields.read(i);
        if (fields.size() != t.columns.size()) __builtin_trap();  // columns must stay aligned
        for (const auto& f : fields) envsift::parse_elevation(f), envsift::parse_elevation_range(f);
      }
    } catch (const envsift::InputError&) {
      // a clean refusal: fine
    }
  }
  envsift::parse_coordinate(text, envsift::Axis::latitude);
  envsift::parse_coordinate(text, envsift::Axis::longitude);
  return 0;
}
