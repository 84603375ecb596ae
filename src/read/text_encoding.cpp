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

}  // namespace

std::string to_utf8(std::string_view text, bool& changed) {
  changed = false;
  std::string out;
  out.reserve(text.size());
  for (std::size_t i = 0; i < text.size();) {
    if (const std::size_t n = utf8_sequence(text, i)) {
      out.append(text.substr(i, n));
      i += n;
    } else {  // a Latin-1 byte 0x80-0xFF is the code point U+0080-U+00FF
      const auto c = static_cast<unsigned char>(text[i++]);
      out += static_cast<char>(0xC0 | (c >> 6));
      out += static_cast<char>(0x80 | (c & 0x3F));
      changed = true;
    }
  }
  return out;
}

}  // namespace envsift
