// foldline help [COMMAND]: the overview, or one command's help (the text `foldline COMMAND
// --help` prints, held in the command's registration).
#include <iostream>

#include "app/cli/command.h"

namespace foldline::cli {
namespace {

const char* kName = "help";

int run_help(int argc, char** argv) {
    if (argc == 1) {
        print_overview(std::cout);
        return kOk;
    }
    if (argc > 2) return fail(kName, kUsage, "expected at most one COMMAND (usage: foldline help [COMMAND])");
    const Command* cmd = find_command(argv[1]);
    if (!cmd) {
        std::string names;
        for (const auto& c : commands()) names += (names.empty() ? "" : ", ") + c.name;
        return fail(kName, kUsage, std::string("unknown command '") + argv[1] + "' (commands: " + names + ")");
    }
    std::cout << cmd->help;
    return kOk;
}

const CommandRegistration registration{Command{
    .name = kName,
    .synopsis = "help [COMMAND]",
    .summary = "this overview, or one command's options (the same as foldline COMMAND --help)",
    .help = "Usage: foldline help [COMMAND]\n"
            "Without COMMAND: the overview of every command and the exit codes.\n"
            "With COMMAND: that command's usage and options (the same as foldline COMMAND --help).\n"
            "Exit codes: 0 done, 2 an unknown COMMAND.\n",
    .run = run_help,
}};

}  // namespace
}  // namespace foldline::cli
