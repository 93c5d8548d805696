// libFuzzer target: the project-file parser. Must never crash; a project it accepts must
// survive a save-and-parse round trip (the saved text parses again to the same text).
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string>
#include <string_view>

#include "core/audit/project_file.h"

using namespace foldline;
using namespace foldline::project;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string_view text(reinterpret_cast<const char*>(data), size);
    const std::string path = "/nonexistent/fuzz/audit.foldline";
    auto p = parse_project(text, path);
    if (!p.ok()) {
        if (p.error().message.empty()) std::abort();
        return 0;
    }
    const std::string saved = project_to_json_text(*p, path);
    auto again = parse_project(saved, path);
    if (!again.ok()) std::abort();
    if (project_to_json_text(*again, path) != saved) std::abort();
    return 0;
}
