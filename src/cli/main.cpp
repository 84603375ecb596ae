// envsift: screen species occurrence records against environmental rasters.
#include <cpl_error.h>
#include <csignal>
#include <new>
#include <cstring>
#include <iostream>
#include <string>

#include "commands.hpp"
#include "envsift/errors.hpp"
#include "envsift/write/atomic_file.hpp"
#include "options.hpp"

namespace {

const char* kUsage =
    "envsift " ENVSIFT_VERSION " - find occurrence records whose environment is implausible for their taxon\n"
    "\n"
    "usage: envsift COMMAND [options]     (envsift COMMAND --help for details)\n"
    "\n"
    "commands:\n"
    "  sample   sample raster layers at every record\n"
    "  screen   sample, test each record against its taxon, and rank suspects for review\n"
    "  merge    combine the outputs of screen --shard I/N into one ranked file\n"
    "  evaluate measure what the tests find: virtual taxa with known errors on your rasters\n"
    "  estimate the peak memory a screen will need (for cluster jobs)\n"
    "\n"
    "Flags are reasons to look, not proof of error: review flagged records before removing any.\n"
    "exit codes: 0 ok, 2 bad command line, 3 bad input, 4 output not written, 5 internal error,\n"
    "            6 out of memory, 130/143 interrupted (SIGINT/SIGTERM; no partial output is left)\n";

void quiet_gdal_handler(CPLErr, CPLErrorNum, const char*) {}  // envsift reports errors itself

}  // namespace

int main(int argc, char** argv) {
  using envsift::ExitCode;
  CPLSetErrorHandler(quiet_gdal_handler);
  envsift::remove_partial_outputs_on_signal();
  std::signal(SIGXFSZ, SIG_IGN);  // a file-size limit then fails the write (exit 4) instead of killing us
  std::signal(SIGPIPE, SIG_IGN);
  if (argc < 2 || !std::strcmp(argv[1], "--help") || !std::strcmp(argv[1], "-h") || !std::strcmp(argv[1], "help")) {
    std::cout << kUsage;
    return argc < 2 ? static_cast<int>(ExitCode::usage) : 0;
  }
  if (!std::strcmp(argv[1], "--version")) {
    std::cout << "envsift " ENVSIFT_VERSION "\n";
    return 0;
  }
  const std::string command = argv[1];
  try {
    if (command == "sample") return envsift::cli::sample_command(argc - 1, argv + 1);
    if (command == "screen") return envsift::cli::screen_command(argc - 1, argv + 1);
    if (command == "merge") return envsift::cli::merge_command(argc - 1, argv + 1);
    if (command == "evaluate") return envsift::cli::evaluate_command(argc - 1, argv + 1);
    if (command == "estimate") return envsift::cli::estimate_command(argc - 1, argv + 1);
    std::cerr << "envsift: error: unknown command '" << command << "'; use sample, screen, merge, evaluate or estimate (envsift --help)\n";
    return static_cast<int>(ExitCode::usage);
  } catch (const envsift::Error& e) {
    std::cerr << "envsift: error: " << envsift::cli::terminal_safe(e.what())
              << (e.code() == ExitCode::output_failed ? " (no output was written: every partial file was removed)" : "")
              << "\n";
    return static_cast<int>(e.code());
  } catch (const std::bad_alloc&) {
    std::cerr << "envsift: error: out of memory: the run needs more memory than this machine or its limits give "
                 "(envsift estimate --records N --layers ... tells what a screen needs); run where there is more memory, or "
                 "split the points file by taxon and screen the parts (no output was written)\n";
    return static_cast<int>(ExitCode::out_of_memory);
  } catch (const std::exception& e) {
    std::cerr << "envsift: internal error: " << envsift::cli::terminal_safe(e.what())
              << "; please report it with the command line used\n";
    return static_cast<int>(ExitCode::internal);
  }
}
