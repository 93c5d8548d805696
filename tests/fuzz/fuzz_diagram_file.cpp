// libFuzzer target: the diagram-file parser and the DOT export. Must never crash; a diagram
// it accepts must survive a write-and-parse round trip.
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string>
#include <string_view>

#include "core/causal/diagram_file.h"

using namespace foldline::causal;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string_view text(reinterpret_cast<const char*>(data), size);
    auto d = parse_diagram(text, "fuzz.diagram.json");
    if (!d.ok()) {
        if (d.error().message.empty()) std::abort();
        return 0;
    }
    const std::string saved = diagram_to_json_text(*d);
    auto again = parse_diagram(saved, "round trip");
    if (!again.ok()) std::abort();
    if (diagram_to_json_text(*again) != saved) std::abort();
    (void)diagram_to_dot(*d);
    return 0;
}
