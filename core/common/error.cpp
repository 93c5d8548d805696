#include "core/common/error.h"

namespace foldline {

std::string Error::to_string() const {
    std::string out;
    if (!file.empty()) out += file;
    if (line > 0) out += (out.empty() ? "line " : ":") + std::to_string(line);
    if (column > 0) out += (line > 0 ? ":" : (out.empty() ? "column " : ": column ")) + std::to_string(column);
    if (!out.empty()) out += ": ";
    out += message;
    return out;
}

}  // namespace foldline
