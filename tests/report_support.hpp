// Reading an HTML report back in the tests: its taxon sections, each with its pictures decoded
// from their data: URIs by coreutils' `base64 -d` (RFC 4648), an outside decoder.
#pragma once
#include <string>
#include <vector>

#include "support.hpp"

namespace envsift::testing {

struct ReportSection {
  std::string taxon, html;            // the section's own HTML
  std::vector<std::string> pictures;  // its SVG documents, in order (the map first)
};

// `scratch`: a directory for the decoded files. (Plain searches: std::regex recurses per character
// and overflows the stack on pictures of 100 kB.)
inline std::vector<ReportSection> report_sections(const std::string& html, const std::string& scratch) {
  static int count = 0;
  std::vector<ReportSection> out;
  const std::string start = "<section class=\"taxon\" id=\"taxon-", picture = "src=\"data:image/svg+xml;base64,";
  for (std::size_t at = html.find(start); at != std::string::npos; at = html.find(start, at + 1)) {
    const std::size_t name = html.find("<h2><i>", at) + 7, end = html.find("</section>", at);
    ReportSection section{html.substr(name, html.find("</i>", name) - name), html.substr(at, end - at), {}};
    for (std::size_t p = html.find(picture, at); p < end; p = html.find(picture, p + 1)) {
      const std::size_t from = p + picture.size();
      const std::string stem = scratch + "/picture" + std::to_string(count++);
      write_file(stem + ".b64", html.substr(from, html.find('"', from) - from));
      EXPECT_EQ(run("base64 -d " + stem + ".b64 > " + stem + ".svg").exit_code, 0);
      section.pictures.push_back(read_file(stem + ".svg"));
    }
    out.push_back(std::move(section));
  }
  return out;
}

// The `<use …/>` element of a picture that marks `record`, or "" when none does.
inline std::string mark_of(const std::string& svg, const std::string& record) {
  const std::size_t at = svg.find("data-record=\"" + record + "\"");
  if (at == std::string::npos) return "";
  const std::size_t begin = svg.rfind('<', at);
  return svg.substr(begin, svg.find('>', at) - begin + 1);
}

// The local references (href="#id") of an SVG document that name no element in it: a `use`
// must refer to an element of the document (SVG 1.1, 5.6 'use' element; from memory).
inline std::vector<std::string> unresolved_references(const std::string& svg) {
  std::vector<std::string> missing;
  const std::string ref = "href=\"#";
  for (std::size_t at = svg.find(ref); at != std::string::npos; at = svg.find(ref, at + 1)) {
    const std::size_t from = at + ref.size();
    const std::string id = svg.substr(from, svg.find('"', from) - from);
    if (svg.find("id=\"" + id + "\"") == std::string::npos) missing.push_back(id);
  }
  return missing;
}

}  // namespace envsift::testing
