// Reason codes: short, stable words written to the `status` column when a record (or one of its
// layer values) could not be used. Several codes are joined with ';'. Layer codes carry the layer
// name after a colon, e.g. `nodata:precip`. docs/reference.md lists them all.
#pragma once
#include <string>
#include <vector>

namespace envsift::reason {

inline const std::string ok = "ok";
// Reading
inline const std::string position_empty = "position_empty";            // longitude or latitude empty
inline const std::string position_not_number = "position_not_number";    // text that is not a number
inline const std::string position_not_finite = "position_not_finite";      // NaN, inf, or overflows a double
inline const std::string position_off_globe = "position_off_globe";  // |lat| > 90 or |lon| > 180
inline const std::string position_hemisphere_conflict = "position_hemisphere_conflict";  // N/S on a longitude, or a sign and a letter
inline const std::string position_maybe_swapped = "position_maybe_swapped";  // reported, never corrected
inline const std::string position_sign_unclear = "position_sign_unclear";  // "(0.2)", "0.2-": a sign where no reader agrees on it
inline const std::string position_zero_zero = "position_zero_zero";        // longitude and latitude both exactly 0: a placeholder
// a vector file's longitude/latitude attributes and its point geometry disagree: which is right is unknown
inline const std::string position_geometry_disagrees = "position_geometry_disagrees";
// Read, but from an unusual form (the record is still used; the code says how it was read)
inline const std::string read_dms = "read_dms";                      // degrees-minutes-seconds
inline const std::string read_hemisphere_letter = "read_hemisphere_letter";        // hemisphere letters
inline const std::string read_decimal_comma = "read_decimal_comma";  // "12,5"
inline const std::string read_dash_as_minus = "read_dash_as_minus";  // "−12.5", "–12.5": a minus sign or dash read as minus
inline const std::string latin1_converted = "latin1_converted";        // bytes not UTF-8, read as Latin-1
inline const std::string duplicate_id = "duplicate_id";                // another record has the same ID
inline const std::string ragged_row = "ragged_row";                  // field count differs from header
inline const std::string spans_lines = "spans_lines";                // a quoted field holds a line break
inline const std::string uncertainty_not_numeric = "uncertainty_not_numeric";
inline const std::string taxon_missing = "taxon_missing";            // empty taxon name (screen only)
inline const std::string uncertainty_capped = "uncertainty_capped";  // disc cut to --max-uncertainty
// (suffix ":<column>") a reported elevation that is not one number with a known unit
inline const std::string elevation_unreadable = "elevation_unreadable";
inline const std::string elevation_ambiguous = "elevation_ambiguous";    // "1,200", "1.200": 1.2 or 1200?
inline const std::string elevation_approximate = "elevation_approximate";  // "ca. 1200 m": read, and noted
// Sampling (suffix ":<layer>")
inline const std::string outside_layer = "outside_layer";  // point falls outside the raster's extent
inline const std::string nodata = "nodata";                // the cell holds the layer's nodata value
// Pre-sampled values (suffix ":<column>")
inline const std::string value_missing = "value_missing";          // the value column is empty
inline const std::string value_not_numeric = "value_not_numeric";  // the value column is not a number
// Screening
inline const std::string no_values = "no_values";          // no layer value at all to test
inline const std::string too_few_records = "too_few_records";  // taxon too small for every test
inline const std::string other_shard = "other_shard";  // --shard: another shard screens this record
// suffix ":<test>": the test flagged so much of the taxon that its flags were withheld
inline const std::string looks_multimodal = "looks_multimodal";
// Ranges (--ranges): the record's taxon has no range in the range layer (no verdict on it)
inline const std::string no_range = "no_range";
// Review (--decisions): a reviewer confirmed the record wrong; kept out of its taxon's statistics
inline const std::string reviewed_error = "reviewed_error";

inline std::string on_layer(const std::string& code, const std::string& layer) { return code + ":" + layer; }

// Whether a code says why a record could not be scored, rather than how it was read or a note
// beside its score (read_decimal_comma, duplicate_id, ragged_row, uncertainty_capped, ...).
bool prevents_scoring(const std::string& code);
// The reason an unscored record was not scored: its first code that prevents scoring, else no_values.
std::string why_not_scored(const std::vector<std::string>& codes);

}  // namespace envsift::reason
