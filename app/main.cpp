// foldline: no arguments (or only Qt options) → the workbench; a subcommand → headless.
#include <cstring>
#include <exception>
#include <iostream>

#include "app/cli/command.h"

#ifdef FOLDLINE_HAVE_UI
#include "ui/workbench.h"
#endif

namespace {

void print_usage(std::ostream& os) {
    os << "Usage: foldline                 open the workbench\n"
          "       foldline COMMAND [ARGS]  run headless\n\nCommands:\n";
    for (const auto& c : foldline::cli::commands())
        os << "  " << c.synopsis << "\n      " << c.summary << "\n";
    os << "\nExit codes: 0 done, 2 usage error, 3 input error, 1 internal error.\n";
}

}  // namespace

int main(int argc, char** argv) {
    using namespace foldline::cli;
    if (argc >= 2 && argv[1][0] != '-') {
        const Command* cmd = find_command(argv[1]);
        if (!cmd) {
            std::cerr << "foldline: unknown command '" << argv[1] << "'\n";
            print_usage(std::cerr);
            return kUsage;
        }
        try {
            return cmd->run(argc - 1, argv + 1);
        } catch (const std::exception& e) {
            return fail(cmd->name, kInternal, std::string("internal error: ") + e.what());
        }
    }
    if (argc >= 2 && (!std::strcmp(argv[1], "--help") || !std::strcmp(argv[1], "-h"))) {
        print_usage(std::cout);
        return kOk;
    }
#ifdef FOLDLINE_HAVE_UI
    return foldline::ui::run_workbench(argc, argv);
#else
    std::cerr << "foldline: this build has no workbench (built with FOLDLINE_BUILD_UI=OFF)\n";
    print_usage(std::cerr);
    return kUsage;
#endif
}
