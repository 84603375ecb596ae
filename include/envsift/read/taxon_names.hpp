// Taxon names as people type them. Names are compared after Unicode NFC normalisation (Unicode
// Standard Annex #15; "é" typed as one character or as e + combining accent is one name) and
// whitespace folding (no-break spaces, tabs, doubled spaces, leading and trailing space), so
// `Thraxula  alba` and `Thraxula alba` are one taxon. Names that then differ only by letter case or by
// a trailing authorship (`Thraxula alba Vend.`) are kept apart — they may be different taxa — but
// are listed together, for a person to decide.
#pragma once
#include <string>
#include <vector>

namespace envsift {

// NFC, whitespace folded; invalid UTF-8 is left as it is (after folding).
std::string normalise_taxon_name(const std::string& name);

// The key two names share when they look like one taxon: lower case, the authorship (from the
// first word after the first that starts with a capital letter or a parenthesis) removed.
std::string taxon_likeness_key(const std::string& normalised_name);

// Groups of at least two names (in the order given) that share a likeness key.
std::vector<std::vector<std::string>> names_that_look_alike(const std::vector<std::string>& names);

}  // namespace envsift
