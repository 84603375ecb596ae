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

// Every output type at once, interrupted at two moments — while the run is still working (its
// outputs begun, GDAL's GeoPackage open with its side files; the demo records 40 times over, so
// that the run takes a while) and when all have finished but none is in place: nothing remains,
// and stderr says no output was written.
TEST(AtomicOutput, EveryOutputTypeInterruptedWhileWorkingAndBeforeCommit) {
  const auto big = temp_dir("atomic-big-input") + "/points.csv";
  run("bash -c '(head -1 " + source_path("demo-points/occurrences.csv") + "; for k in $(seq 40); do tail -n +2 " +
      source_path("demo-points/occurrences.csv") + " | sed \"s/^QM-/Q$k-/\"; done) > " + big + "'");
  for (const std::string signal_name : {"INT", "TERM"})
    for (const std::string moment : {"working", "pause"}) {
      SCOPED_TRACE(signal_name + " " + moment);
      const auto dir = temp_dir("atomic-all-" + signal_name + "-" + moment);
      const bool pause = moment == "pause";
      // working: as soon as the GeoPackage is being written; pause: once the manifest has finished
      const std::string seen = pause ? "run.json" : "gpkg";
      const std::string wait = "for i in $(seq 2000); do ls " + dir + " | grep partial | grep -q " + seen +
                               " && break; sleep 0.01; done; sleep " + (pause ? "0.2" : "0");
      const std::string cmd = std::string("env --default-signal=INT ") + (pause ? "ENVSIFT_TEST_PAUSE_BEFORE_COMMIT=30 " : "") +
                              envsift_binary() + " screen --quiet --points " + (pause ? source_path("demo-points/occurrences.csv") : big) +
                              demo_layers() + " --dem dem --summary " + dir + "/taxa.csv --gis " + dir + "/all.gpkg --report " +
                              dir + "/report.html --manifest " + dir + "/run.json --out " + dir + "/out.csv";
      auto r = run("bash -c '" + cmd + " & pid=$!; " + wait + "; kill -" + signal_name + " $pid; wait $pid; echo exit=$?'");
      EXPECT_NE(r.output.find(signal_name == "INT" ? "exit=130" : "exit=143"), std::string::npos) << r.output;
      EXPECT_EQ(run("ls -A " + dir).output, "") << "left behind in " << dir;
      EXPECT_NE(r.output.find("no output was written"), std::string::npos) << r.output;
    }
}

// One output failing (a file-size limit, the report being the largest) fails the run: no other
// output is put in place either.
TEST(AtomicOutput, AFailingOutputLeavesNoOtherOutput) {
  const auto dir = temp_dir("atomic-fail");
  const std::string cmd = "ulimit -f 200; " + envsift_binary() + " screen --quiet --points " +
                          source_path("demo-points/occurrences.csv") + demo_layers() + " --dem dem --summary " + dir +
                          "/taxa.csv --report " + dir + "/report.html --manifest " + dir + "/run.json --out " + dir + "/out.csv";
  auto r = run("bash -c '" + cmd + "; echo exit=$?'");
  EXPECT_NE(r.output.find("exit=4"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("no output was written"), std::string::npos) << r.output;
  EXPECT_EQ(run("ls -A " + dir).output, "") << "left behind in " << dir;
}

}  // namespace
}  // namespace envsift
