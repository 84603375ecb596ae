#include "envsift/read/taxon_names.hpp"

#include <map>
#include <memory>

#include <unicode/normalizer2.h>
#include <unicode/unistr.h>

namespace envsift {
namespace {

// Folds every run of white space (ASCII, no-break space U+00A0, narrow no-break U+202F, figure
// space U+2007, ideographic space U+3000) into one space, and trims.
std::string fold_whitespace(const std::string& s) {
  std::string out;
  bool space = false;
  for (std::size_t i = 0; i < s.size();) {
    std::size_t width = 0;
    const auto c = static_cast<unsigned char>(s[i]);
    if (c == ' ' || c == '\t' || c == '\r' || c == '\n' || c == '\v' || c == '\f') width = 1;
    else if (s.compare(i, 2, "\xC2\xA0") == 0) width = 2;
    else if (s.compare(i, 3, "\xE2\x80\xAF") == 0 || s.compare(i, 3, "\xE2\x80\x87") == 0 || s.compare(i, 3, "\xE3\x80\x80") == 0)
      width = 3;
    if (width) {
      space = !out.empty();
      i += width;
      continue;
    }
    if (space) out += ' ', space = false;
    out += s[i++];
  }
  return out;
}

}  // namespace

std::string normalise_taxon_name(const std::string& name) {
  const std::string folded = fold_whitespace(name);
  UErrorCode status = U_ZERO_ERROR;
  const icu::Normalizer2* nfc = icu::Normalizer2::getNFCInstance(status);
  if (U_FAILURE(status)) return folded;
  const icu::UnicodeString text = icu::UnicodeString::fromUTF8(folded);
  if (nfc->isNormalized(text, status) && U_SUCCESS(status)) return folded;  // the common case
  status = U_ZERO_ERROR;
  const icu::UnicodeString normal = nfc->normalize(text, status);
  if (U_FAILURE(status)) return folded;
  std::string out;
  normal.toUTF8String(out);
  return out;
}

std::string taxon_likeness_key(const std::string& name) {
  std::string key;
  std::size_t word = 0;
  for (std::size_t i = 0; i < name.size();) {
    const std::size_t end = std::min(name.find(' ', i), name.size());
    const std::string w = name.substr(i, end - i);
    if (word > 0 && !w.empty() && ((w[0] >= 'A' && w[0] <= 'Z') || w[0] == '(')) break;  // the authorship
    key += (key.empty() ? "" : " ") + w;
    ++word;
    i = end + 1;
  }
  icu::UnicodeString lower = icu::UnicodeString::fromUTF8(key);
  lower.foldCase();
  std::string out;
  lower.toUTF8String(out);
  return out;
}

std::vector<std::vector<std::string>> names_that_look_alike(const std::vector<std::string>& names) {
  std::map<std::string, std::vector<std::string>> by_key;
  for (const auto& n : names)
    if (!n.empty()) by_key[taxon_likeness_key(n)].push_back(n);
  std::vector<std::vector<std::string>> groups;
  for (auto& [key, group] : by_key)
    if (group.size() > 1) groups.push_back(std::move(group));
  return groups;
}

}  // namespace envsift
