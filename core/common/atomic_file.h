#pragma once
// Every file Foldline writes (projects, diagrams, memos' side files, exports) goes through here:
// the bytes land in a temporary file in the same folder, are flushed to disk, and only then
// replace the target by rename(2). A failure at any step leaves the previous file intact.
#include <string>
#include <string_view>

#include "core/common/error.h"

namespace foldline {

/// Writes `bytes` to `path` atomically. Returns an Error naming the path and the system's reason
/// (read-only folder, full disk, ...) and removes the temporary file on failure.
Status write_file_atomically(const std::string& path, std::string_view bytes);

/// Test seam: when set, the write fails after the temporary file is complete but before the
/// rename, as a crash at that moment would. Never set outside tests.
void set_atomic_write_fault_for_testing(bool fail_before_rename);

}  // namespace foldline
