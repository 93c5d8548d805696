#pragma once
// Keeps a memory-mapped input from killing the process when the file shrinks under it.
//
// Touching a mapped page past the new end of a truncated file raises SIGBUS. A guarded range
// instead gets a page of zero bytes mapped over the lost page, the read carries on, and the
// range is marked as having faulted, so the reader can refuse the result with a clear message
// ("the file changed while being read") instead of trusting bytes that are no longer the file.
// A SIGBUS outside every guarded range goes to whatever handler was there before (or the
// default action), so other faults still stop the process as they would without the guard.
#include <cstddef>

namespace foldline {

/// Guards [base, base + length). Returns false, leaving the range unguarded, for a null or
/// empty range or when 64 ranges are already guarded at once.
bool guard_mapping(const void* base, std::size_t length);

/// Stops guarding the range that starts at `base`. Returns whether a page in it faulted
/// (the file shrank while mapped); false for a range never guarded.
bool unguard_mapping(const void* base);

/// Whether a page in the guarded range starting at `base` has faulted so far; false for a
/// range never guarded.
bool mapping_faulted(const void* base);

}  // namespace foldline
