// Cells a spreadsheet would run as a formula. A CSV cell that begins with =, +, -, @, a tab or a
// carriage return is evaluated by spreadsheet programs on opening (OWASP, "CSV Injection"):
// `=HYPERLINK(...)` in a taxon name or record ID becomes a live link, `=IMPORTXML(...)` fetches
// from the network. Files envsift makes for spreadsheets (the decisions template, the summary)
// write such cells with a leading apostrophe, which spreadsheets show as text; plain numbers
// ("-12.5") are left as they are. envsift reads its own cells back unchanged.
#pragma once
#include <string>
#include <string_view>

namespace envsift {

// Whether a spreadsheet would take the cell for a formula (a plain number is not one).
bool starts_like_formula(std::string_view cell);

// The cell as written to a file meant for spreadsheets: one apostrophe before a formula-like
// cell, and before a cell that already begins with apostrophes and then a formula character (so
// that reading back is exact).
std::string spreadsheet_safe(std::string_view cell);

// The original cell, from one written by spreadsheet_safe (a spreadsheet that saved the file
// keeps the apostrophe, as LibreOffice and Excel do for such text).
std::string from_spreadsheet_safe(std::string_view cell);

}  // namespace envsift
