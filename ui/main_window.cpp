#include "ui/main_window.h"

#include <QLabel>

namespace foldline::ui {

MainWindow::MainWindow(QWidget* parent) : QMainWindow(parent) {
    setWindowTitle(tr("Foldline"));
    setCentralWidget(new QLabel(tr("Open a data file to begin."), this));
    resize(1200, 800);
}

}  // namespace foldline::ui
