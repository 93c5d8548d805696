#pragma once
// The diagram file (NAME.diagram.json, our own format) and its Graphviz DOT export.
//
//   {
//     "format": "foldline-diagram", "version": 1,          (optional on reading)
//     "nodes": [{"name": "severity", "observed": true, "x": 120.0, "y": 40.0}, ...],
//     "edges": [{"from": "severity", "to": "treatment"}, ...],
//     "exposure": "treatment", "outcome": "recovered"      (optional)
//   }
// "observed" defaults to true; "x"/"y" (editor positions) are optional numbers. Unknown keys
// are ignored. Reading checks the format only; CausalGraph::build checks the graph.
#include <string>
#include <string_view>

#include "core/causal/diagram.h"
#include "core/common/error.h"

namespace foldline::causal {

/// Parses diagram JSON text. Syntax errors carry line and column; structural errors name the
/// element ("nodes[3].name: expected a string"). `source` goes into every Error. Empty text → Error.
Result<Diagram> parse_diagram(std::string_view text, const std::string& source = {});

/// Reads and parses a file. Unreadable file → Error naming it.
Result<Diagram> read_diagram(const std::string& path);

/// The JSON text of a diagram (2-space indent, trailing newline). Empty diagram → valid JSON
/// with empty lists.
std::string diagram_to_json_text(const Diagram& d);

/// Writes atomically: a temporary file in the same folder, then rename over `path`.
/// Failure → Error naming the file; `path` is then left as it was.
Status write_diagram(const Diagram& d, const std::string& path);

/// Graphviz DOT: names as quoted IDs (backslash and double quote escaped, line breaks as \n),
/// unobserved nodes dashed, exposure and outcome drawn as boxes. Empty diagram → an empty digraph.
std::string diagram_to_dot(const Diagram& d);

/// A DOT quoted string for `s`, with the escaping described above.
std::string dot_quoted(std::string_view s);

}  // namespace foldline::causal
