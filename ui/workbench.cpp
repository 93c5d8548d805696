#include "ui/workbench.h"

#include <QApplication>
#include <QCommandLineParser>
#include <QDir>
#include <QIcon>
#include <QTabWidget>
#include <QTimer>
#include <cstdio>

#include "ui/demo.h"
#include "ui/findings_page.h"
#include "ui/main_window.h"

// The resources live in a static library: register them before first use. Outside any
// namespace, as Q_INIT_RESOURCE requires.
static void init_foldline_resources() { Q_INIT_RESOURCE(foldline); }

namespace foldline::ui {

int run_workbench(int argc, char** argv) {
    QApplication app(argc, argv);
    QApplication::setApplicationName(QStringLiteral("Foldline"));
    QApplication::setOrganizationName(QStringLiteral("Foldline"));
    QApplication::setApplicationVersion(QStringLiteral("0.1.0"));
    init_foldline_resources();
    QApplication::setWindowIcon(QIcon(QStringLiteral(":/foldline/icon.svg")));

    QCommandLineParser parser;
    parser.setApplicationDescription(QStringLiteral("Foldline workbench"));
    parser.addHelpOption();
    QCommandLineOption demo(QStringLiteral("demo"), QStringLiteral("Open with the invented lender audit already scanned."));
    QCommandLineOption shots(QStringLiteral("screenshots"),
                             QStringLiteral("Render each step of the demo audit to PNG files in DIR, then exit."),
                             QStringLiteral("DIR"));
    QCommandLineOption dark(QStringLiteral("dark"), QStringLiteral("Use a dark palette (for screenshots)."));
    parser.addOption(demo);
    parser.addOption(shots);
    parser.addOption(dark);
    parser.addPositionalArgument(QStringLiteral("file"),
                                 QStringLiteral("A data file to load, or a saved .foldline audit to open."),
                                 QStringLiteral("[FILE]"));
    parser.process(app);

    if (parser.isSet(dark)) {
        QPalette p;
        p.setColor(QPalette::Window, QColor(QRgb(0x2a2c31)));
        p.setColor(QPalette::WindowText, QColor(QRgb(0xe6e6e6)));
        p.setColor(QPalette::Base, QColor(QRgb(0x1f2125)));
        p.setColor(QPalette::AlternateBase, QColor(QRgb(0x292b30)));
        p.setColor(QPalette::Text, QColor(QRgb(0xe6e6e6)));
        p.setColor(QPalette::Button, QColor(QRgb(0x34363c)));
        p.setColor(QPalette::ButtonText, QColor(QRgb(0xe6e6e6)));
        p.setColor(QPalette::Highlight, QColor(QRgb(0x56B4E9)));
        p.setColor(QPalette::HighlightedText, QColor(QRgb(0x000000)));
        p.setColor(QPalette::ToolTipBase, QColor(QRgb(0x34363c)));
        p.setColor(QPalette::ToolTipText, QColor(QRgb(0xe6e6e6)));
        p.setColor(QPalette::PlaceholderText, QColor(QRgb(0x9a9ca3)));
        // Disabled controls must look disabled: dimmed text, a flatter button.
        for (auto role : {QPalette::WindowText, QPalette::Text, QPalette::ButtonText})
            p.setColor(QPalette::Disabled, role, QColor(QRgb(0x6f727a)));
        p.setColor(QPalette::Disabled, QPalette::Button, QColor(QRgb(0x2e3035)));
        QApplication::setPalette(p);
    }

    MainWindow window;
    if (parser.isSet(shots)) {
        window.resize(1440, 900);
        window.show();
        const QString err = prepare_demo(window);
        if (!err.isEmpty()) std::fprintf(stderr, "foldline: demo: %s\n", qPrintable(err));
        int n = save_screenshots(window, parser.value(shots));
        // A trend audit too: the scatter with pooled and within-stratum lines.
        const QString slope_err = prepare_slope_demo(window);
        if (!slope_err.isEmpty()) std::fprintf(stderr, "foldline: trend demo: %s\n", qPrintable(slope_err));
        else {
            QApplication::processEvents();
            if (window.grab().save(QDir(parser.value(shots)).absoluteFilePath(QStringLiteral("08-trend-findings.png")))) ++n;
            window.findings_page()->chart_tabs()->setCurrentIndex(4);
            QApplication::processEvents();
            if (window.grab().save(QDir(parser.value(shots)).absoluteFilePath(QStringLiteral("09-trend-per-stratum.png")))) ++n;
        }
        std::printf("foldline: wrote %d screenshots to %s\n", n, qPrintable(parser.value(shots)));
        return n > 0 ? 0 : 1;
    }
    window.show();
    // An audit left unsaved by a session that ended abruptly: offer it once the window is up;
    // then the file named on the command line, if any.
    const QString file = parser.positionalArguments().value(0);
    if (!parser.isSet(demo))
        QTimer::singleShot(0, &window, [&window, file] {
            if (window.check_recovery() == RecoveryChoice::Restore || file.isEmpty()) return;
            window.open_file(file);
        });
    if (parser.isSet(demo))
        QTimer::singleShot(0, &window, [&window] {
            const QString err = prepare_demo(window);
            if (!err.isEmpty()) std::fprintf(stderr, "foldline: demo: %s\n", qPrintable(err));
        });
    return QApplication::exec();
}

}  // namespace foldline::ui
