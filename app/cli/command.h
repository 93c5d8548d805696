#pragma once
// Subcommand registry. Each subcommand lives in its own app/cli/<name>_command.cpp and
// registers itself with a static CommandRegistration; main() dispatches by name.
//
// Exit codes, the same for every subcommand:
//   0 done, 2 usage error, 3 input error (message on stderr), 1 internal error.
#include <functional>
#include <string>
#include <vector>

namespace foldline::cli {

enum ExitCode : int { kOk = 0, kInternal = 1, kUsage = 2, kInput = 3 };

struct Command {
    std::string name;
    std::string synopsis;  ///< one line: "inspect DATA [--json FILE|-]"
    std::string summary;   ///< one sentence
    std::function<int(int argc, char** argv)> run;  ///< argv[0] is the subcommand name
};

std::vector<Command>& commands();
const Command* find_command(const std::string& name);

struct CommandRegistration {
    explicit CommandRegistration(Command c) { commands().push_back(std::move(c)); }
};

/// Prints "foldline NAME: message" to stderr and returns the code.
int fail(const std::string& command, int code, const std::string& message);

}  // namespace foldline::cli
