// envsift's own contract (no outside reference; exit statuses 128 + signal are POSIX shell
// convention). Atomic outputs: a run interrupted at the last moment — its output finished in the temporary
// file, not yet renamed (held there by the ENVSIFT_TEST_PAUSE_BEFORE_COMMIT test hook) — leaves
// no file under the final name and no temporary file. Exit status: killed by the signal.
#include <chrono>
#include <thread>

#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

void interrupt_and_check(const std::string& signal_name) {
  const auto dir = temp_dir("atomic-" + signal_name);
  // env --default-signal: a background job of a script starts with SIGINT ignored; restore it
  const std::string cmd = "env --default-signal=INT ENVSIFT_TEST_PAUSE_BEFORE_COMMIT=30 " + envsift_binary() + " screen --points " +
                          source_path("demo-points/occurrences.csv") + demo_layers() + " --summary " + dir +
                          "/taxa.csv --out " + dir + "/out.csv";
  // start in the background, wait until the temporary file exists, then signal the process
  auto r = run("bash -c '" + cmd + " & pid=$!; for i in $(seq 200); do ls " + dir +
               " | grep -q partial && break; sleep 0.05; done; sleep 0.2; kill -" + signal_name +
               " $pid; wait $pid; echo exit=$?'");
  EXPECT_NE(r.output.find(signal_name == "INT" ? "exit=130" : "exit=143"), std::string::npos) << r.output;
  EXPECT_EQ(run("ls -A " + dir).output, "") << "left behind in " << dir;
}

TEST(AtomicOutput, SigtermLeavesNoOutput) { interrupt_and_check("TERM"); }
TEST(AtomicOutput, SigintLeavesNoOutput) { interrupt_and_check("INT"); }

}  // namespace
}  // namespace envsift
