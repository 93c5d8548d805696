// foldline: no arguments (or only Qt options) → the workbench; FILE (a data file or a saved
// .foldline audit) → the workbench with it open; a subcommand → headless.
// `--help` / `-h` after a subcommand prints its help from the registration (before the command
// parses anything); `--version` / `-V` and the no-display check never touch Qt.
#include <cstdlib>
#include <cstring>
#include <exception>
#include <filesystem>
#include <iostream>
#include <string>

#include "app/cli/command.h"

#ifdef FOLDLINE_HAVE_UI
#include "ui/workbench.h"
#endif

#ifndef FOLDLINE_VERSION
#error "FOLDLINE_VERSION is set by app/CMakeLists.txt from the project's version"
#endif

namespace {

bool is(const char* arg, const char* a, const char* b) { return !std::strcmp(arg, a) || !std::strcmp(arg, b); }

#ifdef FOLDLINE_HAVE_UI
/// False when Qt would find no display: on X11/Wayland systems, DISPLAY and WAYLAND_DISPLAY
/// unset and no platform chosen (QT_QPA_PLATFORM or -platform, e.g. offscreen for tests).
bool display_available(int argc, char** argv) {
#if defined(_WIN32) || defined(__APPLE__)
    (void)argc;
    (void)argv;
    return true;
#else
    auto set = [](const char* name) {
        const char* v = std::getenv(name);
        return v && *v;
    };
    if (set("DISPLAY") || set("WAYLAND_DISPLAY") || set("QT_QPA_PLATFORM")) return true;
    for (int i = 1; i < argc; ++i)
        if (is(argv[i], "-platform", "--platform")) return true;
    return false;
#endif
}
#endif

std::string command_names() {
    std::string names;
    for (const auto& c : foldline::cli::commands()) names += (names.empty() ? "" : ", ") + c.name;
    return names;
}

}  // namespace

int main(int argc, char** argv) {
    using namespace foldline::cli;
    if (argc >= 2 && argv[1][0] != '-') {
        const Command* cmd = find_command(argv[1]);
        // `foldline FILE`: a data file or a saved audit for the workbench (below).
        std::error_code ec;
        const bool file = !cmd && std::filesystem::is_regular_file(argv[1], ec);
        if (!cmd && !file) {
            std::cerr << "foldline: unknown command '" << argv[1] << "'\n";
            print_overview(std::cerr);
            return kUsage;
        }
        if (cmd && wants_help(argc, argv, 2)) {
            std::cout << cmd->help;
            return kOk;
        }
        if (cmd) {
            try {
                return cmd->run(argc - 1, argv + 1);
            } catch (const std::exception& e) {
                return fail(cmd->name, kInternal, std::string("internal error: ") + e.what());
            }
        }
    }
    if (argc >= 2 && is(argv[1], "--help", "-h")) {
        print_overview(std::cout);
        return kOk;
    }
    if (argc >= 2 && is(argv[1], "--version", "-V")) {
        std::cout << "foldline " << FOLDLINE_VERSION << "\n";
        return kOk;
    }
#ifdef FOLDLINE_HAVE_UI
    if (!display_available(argc, argv)) {
        std::cerr << "foldline: the workbench needs a display (none found: DISPLAY and WAYLAND_DISPLAY are unset); "
                     "these commands run headless: "
                  << command_names() << " (foldline help)\n";
        return kUsage;
    }
    return foldline::ui::run_workbench(argc, argv);
#else
    std::cerr << "foldline: this build has no workbench (built with FOLDLINE_BUILD_UI=OFF); these commands run "
                 "headless: "
              << command_names() << " (foldline help)\n";
    return kUsage;
#endif
}
