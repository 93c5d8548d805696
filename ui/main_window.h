#pragma once
#include <QMainWindow>

namespace foldline::ui {

/// The workbench window: Source → Question → Scan → Findings → Diagram → Memo.
class MainWindow : public QMainWindow {
    Q_OBJECT
public:
    explicit MainWindow(QWidget* parent = nullptr);
};

}  // namespace foldline::ui
