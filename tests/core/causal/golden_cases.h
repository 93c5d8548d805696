#pragma once
// Reader for dsep_golden.txt (written by tests/reference/dsep_reference.py from networkx).
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "core/causal/graph.h"

namespace foldline::causal::fixtures {

struct GoldenQuery {
    char kind = 'D';               ///< 'D' d-separation, 'A' minimal adjustment sets
    std::vector<int> x, y, z;      ///< for 'A', z = the usable nodes
    bool separated = false;        ///< 'D': the networkx answer
    std::vector<std::vector<int>> sets;  ///< 'A': brute-force minimal sets (sorted)
    std::string text;              ///< the line, for failure messages
};

struct GoldenGraph {
    Graph graph;
    std::vector<GoldenQuery> queries;
};

inline std::vector<int> golden_list(const std::string& s) {
    std::vector<int> out;
    std::stringstream ss(s);
    std::string item;
    while (std::getline(ss, item, ',')) {
        auto b = item.find_first_not_of(' ');
        if (b == std::string::npos || item[b] == '-') continue;
        out.push_back(std::stoi(item.substr(b)));
    }
    return out;
}

inline std::vector<GoldenGraph> read_golden(const std::string& path) {
    std::vector<GoldenGraph> out;
    std::ifstream in(path);
    std::string line;
    while (std::getline(in, line)) {
        if (line.empty() || line[0] == '#') continue;
        if (line[0] == 'G') {
            out.push_back({Graph(std::stoi(line.substr(2))), {}});
        } else if (line[0] == 'E') {
            std::stringstream ss(line.substr(2));
            int a, b;
            ss >> a >> b;
            out.back().graph.add_edge(a, b);
        } else {
            GoldenQuery q;
            q.kind = line[0];
            q.text = line;
            auto eq = line.find('=');
            std::string lhs = line.substr(2, eq - 2), rhs = line.substr(eq + 2);
            auto p1 = lhs.find(';'), p2 = lhs.find(';', p1 + 1);
            q.x = golden_list(lhs.substr(0, p1));
            q.y = golden_list(lhs.substr(p1 + 1, p2 - p1 - 1));
            q.z = golden_list(lhs.substr(p2 + 1));
            if (q.kind == 'D') {
                q.separated = rhs == "1";
            } else if (rhs != "none") {
                std::stringstream ss(rhs);
                std::string set;
                while (std::getline(ss, set, '|')) q.sets.push_back(golden_list(set));
            }
            out.back().queries.push_back(std::move(q));
        }
    }
    return out;
}

}  // namespace foldline::causal::fixtures
