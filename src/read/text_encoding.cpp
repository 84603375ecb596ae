#include "envsift/read/text_encoding.hpp"

namespace envsift {
namespace {

// Length of the valid UTF-8 sequence starting at s[i], or 0.
std::size_t utf8_sequence(std::string_view s, std::size_t i) {
  const auto b = [&](std::size_t k) { return static_cast<unsigned char>(s[k]); };
  const unsigned char c = b(i);
  if (c < 0x80) return 1;
  std::size_t n;
  unsigned char lo = 0x80, hi = 0xBF;  // allowed range of the second byte
  if (c >= 0xC2 && c <= 0xDF) n = 2;
  else if (c == 0xE0) n = 3, lo = 0xA0;
  else if (c >= 0xE1 && c <= 0xEC) n = 3;
  else if (c == 0xED) n = 3, hi = 0x9F;  // no surrogates
  else if (c >= 0xEE && c <= 0xEF) n = 3;
  else if (c == 0xF0) n = 4, lo = 0x90;
  else if (c >= 0xF1 && c <= 0xF3) n = 4;
  else if (c == 0xF4) n = 4, hi = 0x8F;  // ≤ U+10FFFF
  else return 0;
  if (i + n > s.size() || b(i + 1) < lo || b(i + 1) > hi) return 0;
  for (std::size_t k = 2; k < n; ++k)
    if (b(i + k) < 0x80 || b(i + k) > 0xBF) return 0;
  return n;
}

// Windows-1252 for the bytes 0x80-0x9F, which ISO 8859-1 leaves to control codes: files called
// Latin-1 are nearly always written by Windows programs in Windows-1252, and the WHATWG Encoding
// Standard decodes the labels "latin1" and "iso-8859-1" so. Its five unassigned bytes keep
// their Latin-1 code points. 0x96 is the en dash a word processor writes for a minus sign.
constexpr char32_t kWindows1252[32] = {
    0x20AC, 0x0081, 0x201A, 0x0192, 0x201E, 0x2026, 0x2020, 0x2021, 0x02C6, 0x2030, 0x0160, 0x2039, 0x0152, 0x008D, 0x017D, 0x008F,
    0x0090, 0x2018, 0x2019, 0x201C, 0x201D, 0x2022, 0x2013, 0x2014, 0x02DC, 0x2122, 0x0161, 0x203A, 0x0153, 0x009D, 0x017E, 0x0178};

void append_utf8(std::string& out, char32_t c) {
  if (c < 0x800) {
    out += static_cast<char>(0xC0 | (c >> 6));
  } else {
    out += static_cast<char>(0xE0 | (c >> 12));
    out += static_cast<char>(0x80 | ((c >> 6) & 0x3F));
  }
  out += static_cast<char>(0x80 | (c & 0x3F));
}

}  // namespace

std::string to_utf8(std::string_view text, bool& changed) {
  changed = false;
  std::string out;
  out.reserve(text.size());
  for (std::size_t i = 0; i < text.size();) {
    if (const std::size_t n = utf8_sequence(text, i)) {
      out.append(text.substr(i, n));
      i += n;
    } else {  // a Latin-1 (Windows-1252) byte: 0xA0-0xFF is U+00A0-U+00FF
      const auto c = static_cast<unsigned char>(text[i++]);
      append_utf8(out, c < 0xA0 ? kWindows1252[c - 0x80] : c);
      changed = true;
    }
  }
  return out;
}

}  // namespace envsift
