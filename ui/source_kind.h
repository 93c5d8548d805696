#pragma once
// What kind of source the current table came from. Every decision that depends on it (may the
// audit be saved as a project, is there a file to re-read or hash, which tab to show) reads the
// kind, never the source's display name, which is translated and can equal a file's name.
#include <QCoreApplication>
#include <QString>

namespace foldline::ui {

enum class SourceKind {
    None,      ///< nothing loaded
    File,      ///< a CSV/TSV file (the demo's sample included): the source is its path
    Database,  ///< counted in a database: the source is a description of the connection
    TypedIn,   ///< counts typed or pasted into the grid: no file behind it
};

/// The display name of typed-in counts (the source shown, and the "file" in their errors).
inline QString typed_in_source_name() { return QCoreApplication::translate("SourceKind", "typed-in table"); }

}  // namespace foldline::ui
