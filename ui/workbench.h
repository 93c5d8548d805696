#pragma once
// Entry point of the desktop workbench (called by app/main.cpp when no subcommand is given).
namespace foldline::ui {
int run_workbench(int argc, char** argv);
}
