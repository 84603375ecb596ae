#include "envsift/errors.hpp"

namespace envsift {

static std::string join_message(const std::string& where, const std::string& what, const std::string& todo) {
  return where + ": " + what + (todo.empty() ? "" : "; " + todo);
}

InputError::InputError(const std::string& file, std::size_t line, const std::string& what, const std::string& todo)
    : Error(ExitCode::bad_input, join_message(file + ":" + std::to_string(line), what, todo)) {}

InputError::InputError(const std::string& file, const std::string& what, const std::string& todo)
    : Error(ExitCode::bad_input, join_message(file, what, todo)) {}

OutputError::OutputError(const std::string& file, const std::string& what)
    : Error(ExitCode::output_failed, join_message(file, what, "check the path exists, is writable and the disk has room")) {}

}  // namespace envsift
