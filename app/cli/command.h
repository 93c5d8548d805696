#pragma once
// Subcommand registry. Each subcommand lives in its own app/cli/<name>_command.cpp and
// registers itself with a static CommandRegistration; main() dispatches by name and answers
// `--help` / `-h` (and `foldline help NAME`) from the registration before the command runs.
//
// Exit codes, the same for every subcommand:
//   0 done, 2 usage error, 3 input error (message on stderr), 1 internal error.
#include <functional>
#include <iosfwd>
#include <string>
#include <vector>

namespace foldline::cli {

enum ExitCode : int { kOk = 0, kInternal = 1, kUsage = 2, kInput = 3 };

struct Command {
    std::string name;
    std::string synopsis;  ///< one line: "inspect DATA [--json FILE|-]"
    std::string summary;   ///< one sentence
    /// What `foldline NAME --help` prints: "Usage: foldline NAME ..." lines, the options, and
    /// anything the exit codes add to the shared ones; ends with a newline.
    std::string help;
    std::function<int(int argc, char** argv)> run;  ///< argv[0] is the subcommand name
};

std::vector<Command>& commands();
const Command* find_command(const std::string& name);

struct CommandRegistration {
    explicit CommandRegistration(Command c) { commands().push_back(std::move(c)); }
};

/// True when argv[first..] holds `--help` or `-h`: the command's help is printed instead of
/// running it, whatever else the line holds.
bool wants_help(int argc, char** argv, int first);

/// The overview: how to start the workbench or a command, each command's synopsis and summary,
/// the exit codes.
void print_overview(std::ostream& os);

/// Prints "foldline NAME: message" to stderr and returns the code.
int fail(const std::string& command, int code, const std::string& message);

}  // namespace foldline::cli
