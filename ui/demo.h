#pragma once
// The demo audit (an invented lender's approvals) and the screenshots of each step.
#include <QString>

namespace foldline::ui {

class MainWindow;

/// Path of sample_data/<name> found next to the executable or in the source tree; empty if none.
QString find_sample(const QString& name);
/// Loads the lender sample (or, without a CSV reader, its typed-in counts), sets the question,
/// scans, selects the top finding and seeds its diagram, waiting up to `timeout_ms` in the event
/// loop. Returns an empty string on success, else what went wrong.
QString prepare_demo(MainWindow& w, int timeout_ms = 60000);
/// Loads the retail sample and scans the trend of weekly_sales on promo_spend; as prepare_demo.
QString prepare_slope_demo(MainWindow& w, int timeout_ms = 60000);
/// Renders each step of `w` to DIR/NN-step.png (creating DIR). Returns the number written.
int save_screenshots(MainWindow& w, const QString& dir);

}  // namespace foldline::ui
