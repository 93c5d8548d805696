#include "core/causal/diagram_file.h"

#include <fstream>
#include <sstream>

#include <nlohmann/json.hpp>

#include "core/common/atomic_file.h"
#include "core/common/json_text.h"

namespace foldline::causal {

using nlohmann::json;

namespace {

Result<std::string> get_string(const json& obj, const char* key, const std::string& where, bool required,
                               const std::string& source) {
    auto it = obj.find(key);
    if (it == obj.end() || it->is_null()) {
        if (required) return make_error(where + ": missing \"" + key + "\" (expected a string)", source);
        return std::string{};
    }
    if (!it->is_string()) return make_error(where + "." + key + ": expected a string", source);
    return it->get<std::string>();
}

}  // namespace

Result<Diagram> parse_diagram(std::string_view text, const std::string& source) {
    auto parsed = parse_json_text(text, source, "not valid JSON: ");
    if (!parsed) return parsed.error();
    json doc = std::move(*parsed);
    if (!doc.is_object()) return make_error("expected a JSON object with \"nodes\" and \"edges\"", source, 1, 1);
    Diagram d;
    auto nodes = doc.find("nodes");
    if (nodes == doc.end() || !nodes->is_array())
        return make_error("missing \"nodes\" (expected a list of {\"name\", \"observed\"})", source);
    for (std::size_t i = 0; i < nodes->size(); ++i) {
        const json& jn = (*nodes)[i];
        const std::string where = "nodes[" + std::to_string(i) + "]";
        if (!jn.is_object()) return make_error(where + ": expected an object {\"name\", \"observed\"}", source);
        DiagramNode node;
        auto name = get_string(jn, "name", where, true, source);
        if (!name) return name.error();
        node.name = *name;
        if (auto ob = jn.find("observed"); ob != jn.end() && !ob->is_null()) {
            if (!ob->is_boolean()) return make_error(where + ".observed: expected true or false", source);
            node.observed = ob->get<bool>();
        }
        for (const char* key : {"x", "y"}) {
            auto it = jn.find(key);
            if (it == jn.end() || it->is_null()) continue;
            if (!it->is_number()) return make_error(where + "." + key + ": expected a number", source);
            (key[0] == 'x' ? node.x : node.y) = it->get<double>();
        }
        d.nodes.push_back(std::move(node));
    }
    auto edges = doc.find("edges");
    if (edges != doc.end() && !edges->is_null()) {
        if (!edges->is_array()) return make_error("\"edges\": expected a list of {\"from\", \"to\"}", source);
        for (std::size_t i = 0; i < edges->size(); ++i) {
            const json& je = (*edges)[i];
            const std::string where = "edges[" + std::to_string(i) + "]";
            if (!je.is_object()) return make_error(where + ": expected an object {\"from\", \"to\"}", source);
            auto from = get_string(je, "from", where, true, source);
            if (!from) return from.error();
            auto to = get_string(je, "to", where, true, source);
            if (!to) return to.error();
            d.edges.push_back({*from, *to});
        }
    }
    auto exposure = get_string(doc, "exposure", "diagram", false, source);
    if (!exposure) return exposure.error();
    auto outcome = get_string(doc, "outcome", "diagram", false, source);
    if (!outcome) return outcome.error();
    d.exposure = *exposure;
    d.outcome = *outcome;
    return d;
}

Result<Diagram> read_diagram(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) return make_error("cannot open the diagram file for reading", path);
    std::ostringstream buf;
    buf << in.rdbuf();
    if (in.bad()) return make_error("cannot read the diagram file", path);
    return parse_diagram(buf.str(), path);
}

std::string diagram_to_json_text(const Diagram& d) {
    json doc = json::object();
    doc["format"] = "foldline-diagram";
    doc["version"] = 1;
    json nodes = json::array();
    for (const auto& n : d.nodes) {
        json jn = {{"name", n.name}, {"observed", n.observed}};
        if (n.x) jn["x"] = *n.x;
        if (n.y) jn["y"] = *n.y;
        nodes.push_back(std::move(jn));
    }
    doc["nodes"] = std::move(nodes);
    json edges = json::array();
    for (const auto& e : d.edges) edges.push_back({{"from", e.from}, {"to", e.to}});
    doc["edges"] = std::move(edges);
    if (!d.exposure.empty()) doc["exposure"] = d.exposure;
    if (!d.outcome.empty()) doc["outcome"] = d.outcome;
    // Replace rather than throw on invalid UTF-8 in a name (a column name read from bytes).
    return doc.dump(2, ' ', false, json::error_handler_t::replace) + "\n";
}

Status write_diagram(const Diagram& d, const std::string& path) {
    return write_file_atomically(path, diagram_to_json_text(d));
}

std::string dot_quoted(std::string_view s) {
    std::string out = "\"";
    for (char c : s) {
        switch (c) {
            case '"': out += "\\\""; break;
            case '\\': out += "\\\\"; break;
            case '\n': out += "\\n"; break;
            case '\r': break;
            default: out += c;
        }
    }
    return out + "\"";
}

std::string diagram_to_dot(const Diagram& d) {
    std::string out = "digraph diagram {\n";
    for (const auto& n : d.nodes) {
        std::string attrs;
        auto add = [&](const std::string& a) { attrs += (attrs.empty() ? "" : ", ") + a; };
        if (!n.observed) add("style=dashed");
        if (n.name == d.exposure || n.name == d.outcome) add("shape=box");
        out += "  " + dot_quoted(n.name);
        if (!attrs.empty()) out += " [" + attrs + "]";
        out += ";\n";
    }
    for (const auto& e : d.edges) out += "  " + dot_quoted(e.from) + " -> " + dot_quoted(e.to) + ";\n";
    out += "}\n";
    return out;
}

}  // namespace foldline::causal
