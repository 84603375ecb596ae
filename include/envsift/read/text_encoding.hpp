// Text that is not UTF-8: occurrence files from older software are often Latin-1 (ISO 8859-1).
#pragma once
#include <string>
#include <string_view>

namespace envsift {

// Copies valid UTF-8 sequences (RFC 3629: no overlongs, no surrogates, at most U+10FFFF) and
// reads every other byte as a Latin-1 character (Windows-1252 for 0x80-0x9F, as the WHATWG
// Encoding Standard decodes "latin1"), re-encoded in UTF-8. `changed` tells whether
// any byte was re-encoded.
std::string to_utf8(std::string_view text, bool& changed);

}  // namespace envsift
