#include "app/cli/command.h"

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

int fail(const std::string& command, int code, const std::string& message) {
    std::cerr << "foldline " << command << ": " << message << '\n';
    return code;
}

}  // namespace foldline::cli
