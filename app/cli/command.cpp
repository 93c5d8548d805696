#include "app/cli/command.h"

#include <cstring>
#include <iostream>

namespace foldline::cli {

std::vector<Command>& commands() {
    static std::vector<Command> all;
    return all;
}

const Command* find_command(const std::string& name) {
    for (const auto& c : commands())
        if (c.name == name) return &c;
    return nullptr;
}

bool wants_help(int argc, char** argv, int first) {
    for (int i = first; i < argc; ++i)
        if (!std::strcmp(argv[i], "--help") || !std::strcmp(argv[i], "-h")) return true;
    return false;
}

void print_overview(std::ostream& os) {
    os << "Usage: foldline                 open the workbench\n"
          "       foldline COMMAND [ARGS]  run headless\n"
          "       foldline help COMMAND    a command's options (also: foldline COMMAND --help)\n"
          "       foldline --version\n\nCommands:\n";
    for (const auto& c : commands()) os << "  " << c.synopsis << "\n      " << c.summary << "\n";
    os << "\nExit codes: 0 done, 2 usage error, 3 input error, 1 internal error.\n";
}

int fail(const std::string& command, int code, const std::string& message) {
    std::cerr << "foldline " << command << ": " << message << '\n';
    return code;
}

}  // namespace foldline::cli
