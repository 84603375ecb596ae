// The demo report opened in a real browser: Debian's headless Chromium loads it with no console
// message (errors, Content-Security-Policy violations) and without a single network request from
// the page (Chromium's own net log, --log-net-log), and renders the screenshot kept in docs/
// (written to the test's working directory as report-screenshot.png).
// Readable without JavaScript holds by construction: the report has no script and its
// Content-Security-Policy forbids any (html_report_test checks both). Chromium 156's --dump-dom and
// --screenshot wrote nothing with scripts disabled when tried, so that is not run here.
// Each check first runs on a control page that does misbehave, so a check that cannot fail fails.
#include <cstdio>

#include <unistd.h>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

struct BrowserRun {
  std::vector<std::string> console;  // console messages the page caused
  std::vector<std::string> requests; // network URLs the page asked for
  std::string dom;
};

// Opens `page` in headless Chromium (flags as Debian's package documents them for servers).
BrowserRun open_in_chromium(const std::string& page, const std::string& dir, const std::string& extra = "") {
  const std::string net_log = dir + "/net-log.json";
  std::remove(net_log.c_str());
  const auto r = run("timeout 120 chromium --headless --no-sandbox --disable-gpu --no-first-run "
                     "--disable-background-networking --disable-component-update --disable-sync --disable-quic "
                     "--user-data-dir=" + dir + "/profile --enable-logging=stderr --v=0 --log-net-log=" + net_log +
                     " --virtual-time-budget=5000 " + extra + " --dump-dom 'file://" + page + "'");
  EXPECT_EQ(r.exit_code, 0) << r.output.substr(0, 2000);
  BrowserRun b;
  std::istringstream lines(r.output);
  for (std::string line; std::getline(lines, line);) {
    if (line.find(":CONSOLE") != std::string::npos) b.console.push_back(line);
    else if (line.rfind("<", 0) == 0 || !b.dom.empty()) b.dom += line + "\n";
  }
  // The net log is JSON; a browser that is stopped leaves it without its closing brackets.
  std::string text = read_file(net_log);
  auto log = nlohmann::json::parse(text, nullptr, false);
  if (log.is_discarded()) {
    while (!text.empty() && (text.back() == '\n' || text.back() == ',')) text.pop_back();
    log = nlohmann::json::parse(text + "]}", nullptr, false);
  }
  EXPECT_FALSE(log.is_discarded()) << "unreadable net log";
  if (!log.is_discarded())
    for (const auto& e : log["events"]) {
      const auto& p = e.value("params", nlohmann::json::object());
      // the page's own requests carry its site (file://); Chromium's background ones do not
      if (p.contains("url") && p.contains("site_for_cookies") &&
          p["site_for_cookies"].get<std::string>().find("site=file://") != std::string::npos)
        b.requests.push_back(p["url"]);
    }
  return b;
}

class ReportInBrowser : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    dir_ = temp_dir("browser-" + std::to_string(::getpid()));  // ctest runs tests in parallel processes
    const auto r = run(envsift_binary() + " screen --quiet --points " + source_path("demo-points/occurrences.csv") +
                       demo_layers() + " --dem dem --out " + dir_ + "/out.csv --report " + dir_ + "/report.html");
    ASSERT_EQ(r.exit_code, 0) << r.output;
  }
  static std::string dir_;
};
std::string ReportInBrowser::dir_;

TEST_F(ReportInBrowser, ControlPageIsCaught) {
  write_file(dir_ + "/control.html",
             "<!DOCTYPE html><html><body><img src=\"http://127.0.0.1:9/x.png\">"
             "<script>console.error('control')</script></body></html>");
  const auto b = open_in_chromium(dir_ + "/control.html", dir_);
  EXPECT_FALSE(b.console.empty());
  ASSERT_FALSE(b.requests.empty());
  EXPECT_EQ(b.requests[0], "http://127.0.0.1:9/x.png");
}

TEST_F(ReportInBrowser, OpensWithoutConsoleMessagesOrNetworkRequests) {
  const auto b = open_in_chromium(dir_ + "/report.html", dir_);
  EXPECT_TRUE(b.console.empty()) << b.console.front();
  EXPECT_TRUE(b.requests.empty()) << b.requests.front();
  EXPECT_NE(b.dom.find("Flags are reasons to look, not proof of error"), std::string::npos);
  EXPECT_NE(b.dom.find("Oxmontia nivicola"), std::string::npos);
}

TEST_F(ReportInBrowser, Screenshot) {
  const std::string shot = "report-screenshot.png";
  std::remove(shot.c_str());
  const auto r = run("timeout 120 chromium --headless --no-sandbox --disable-gpu --no-first-run "
                     "--disable-background-networking --disable-component-update --disable-sync --disable-quic "
                     "--user-data-dir=" + dir_ + "/profile-shot --hide-scrollbars --window-size=1280,1800 "
                     "--virtual-time-budget=5000 --screenshot=" + shot + " 'file://" + dir_ + "/report.html'");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const std::string png = read_file(shot);
  ASSERT_GT(png.size(), 8u);
  EXPECT_EQ(png.substr(0, 8), std::string("\x89PNG\r\n\x1a\n", 8));
  EXPECT_GT(png.size(), 60000u);  // a blank page is about 10 kB
}

}  // namespace
}  // namespace envsift
