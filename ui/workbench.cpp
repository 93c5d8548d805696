#include "ui/workbench.h"

#include <QApplication>

#include "ui/main_window.h"

namespace foldline::ui {

int run_workbench(int argc, char** argv) {
    QApplication app(argc, argv);
    QApplication::setApplicationName(QStringLiteral("Foldline"));
    QApplication::setOrganizationName(QStringLiteral("Foldline"));
    MainWindow window;
    window.show();
    return QApplication::exec();
}

}  // namespace foldline::ui
