// Reads graphs and queries on standard input and answers them with core/causal, so that
// dsep_reference.py can compare every answer with networkx. Protocol, one item per line:
//   G n              start a graph with nodes 0..n-1
//   E a b            edge a -> b
//   D xs ; ys ; zs   d-separation query (comma-separated node lists, "-" for empty)  → "1"/"0"
//   A xs ; ys ; us   minimal adjustment sets using only nodes us → "sets k s1|s2|..." where each
//                    set is comma-separated ("-" for the empty set), then "smallest s" or "smallest none"
//   I us             implied independences with observed nodes us → "claims k", then k lines
//                    "a b form given" (form parents|separator|untestable, given as above)
#include <iostream>
#include <sstream>
#include <string>
#include <vector>

#include "core/causal/adjustment.h"
#include "core/causal/dseparation.h"
#include "core/causal/implications.h"

using namespace foldline::causal;

namespace {

std::vector<int> parse_list(std::string s) {
    std::vector<int> out;
    std::stringstream ss(s);
    std::string item;
    while (std::getline(ss, item, ',')) {
        auto b = item.find_first_not_of(' ');
        if (b == std::string::npos) continue;
        item = item.substr(b);
        if (item.empty() || item[0] == '-') continue;
        out.push_back(std::stoi(item));
    }
    return out;
}

std::string show(const std::vector<int>& s) {
    if (s.empty()) return "-";
    std::string out;
    for (std::size_t i = 0; i < s.size(); ++i) {
        if (i) out += ',';
        out += std::to_string(s[i]);
    }
    return out;
}

}  // namespace

int main() {
    Graph g;
    std::string line;
    while (std::getline(std::cin, line)) {
        if (line.empty()) continue;
        char kind = line[0];
        std::string rest = line.substr(1);
        if (kind == 'G') {
            g = Graph(std::stoi(rest));
        } else if (kind == 'E') {
            std::stringstream ss(rest);
            int a, b;
            ss >> a >> b;
            g.add_edge(a, b);
        } else if (kind == 'I') {
            const auto claims = implied_independences(g, to_mask(g.size(), parse_list(rest)));
            std::cout << "claims " << claims.size() << "\n";
            for (const auto& c : claims)
                std::cout << c.a << " " << c.b << " " << to_string(c.form) << " " << show(c.given) << "\n";
        } else if (kind == 'D' || kind == 'A') {
            auto p1 = rest.find(';'), p2 = rest.find(';', p1 + 1);
            auto x = parse_list(rest.substr(0, p1));
            auto y = parse_list(rest.substr(p1 + 1, p2 - p1 - 1));
            auto z = parse_list(rest.substr(p2 + 1));
            if (kind == 'D') {
                std::cout << (d_separated(g, x, y, z) ? 1 : 0) << "\n";
            } else {
                auto sets = minimal_adjustment_sets(g, x, y, to_mask(g.size(), z));
                std::cout << "sets " << sets.sets.size() << " ";
                for (std::size_t i = 0; i < sets.sets.size(); ++i) std::cout << (i ? "|" : "") << show(sets.sets[i]);
                auto small = smallest_adjustment_set(g, x, y, to_mask(g.size(), z));
                std::cout << "\nsmallest " << (small ? show(*small) : std::string("none")) << "\n";
            }
        }
    }
    return 0;
}
