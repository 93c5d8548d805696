#include "ui/layered_layout.h"

#include <algorithm>
#include <map>

namespace foldline::ui {

std::vector<QPointF> layered_layout(const std::vector<QString>& names, const std::vector<std::pair<int, int>>& edges,
                                    int exposure, int outcome, double dx, double dy) {
    const int n = static_cast<int>(names.size());
    std::vector<int> layer(std::size_t(n), 0);
    for (int pass = 0; pass < n; ++pass) {
        bool changed = false;
        for (const auto& [a, b] : edges) {
            if (a < 0 || b < 0 || a >= n || b >= n) continue;
            if (layer[std::size_t(b)] < layer[std::size_t(a)] + 1) layer[std::size_t(b)] = layer[std::size_t(a)] + 1, changed = true;
        }
        if (!changed) break;
    }
    std::map<int, std::vector<int>> by_layer;
    for (int i = 0; i < n; ++i) by_layer[layer[std::size_t(i)]].push_back(i);
    std::vector<QPointF> pos(static_cast<std::size_t>(n));
    for (auto& [l, members] : by_layer) {
        std::sort(members.begin(), members.end(), [&](int a, int b) { return names[std::size_t(a)] < names[std::size_t(b)]; });
        int k = 0;
        for (const int i : members) {
            double y = 0;
            if (i != exposure && i != outcome) {
                y = (k % 2 == 0 ? -1.0 : 1.0) * (k / 2 + 1) * dy;
                ++k;
            }
            pos[std::size_t(i)] = QPointF(l * dx, y);
        }
    }
    return pos;
}

}  // namespace foldline::ui
