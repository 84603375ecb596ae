// Subcommands of the envsift program. Each parses its options and calls the library.
#pragma once

namespace envsift::cli {
int sample_command(int argc, char** argv);
int screen_command(int argc, char** argv);
int merge_command(int argc, char** argv);
int evaluate_command(int argc, char** argv);
int estimate_command(int argc, char** argv);
}  // namespace envsift::cli
