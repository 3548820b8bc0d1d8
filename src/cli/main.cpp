// Entry point of the arcsieve command: builds the subcommands and maps errors to exit codes
// (0 success, 1 a check failed, 2 bad input, 3 internal error).
#include <iostream>

#include "cli/commands.hpp"

int main(int argc, char** argv) {
    CLI::App app{
        "arcsieve: elliptic-curve data, first hits on a real arc and smallest solutions of cubic "
        "representation problems such as a/(b+c) + b/(c+a) + c/(a+b) = N"};
    app.require_subcommand(1);
    arcsieve::cli::Context context;
    arcsieve::cli::register_inspect(app, context);
    arcsieve::cli::register_verify(app, context);
    arcsieve::cli::register_survey(app, context);
    arcsieve::cli::register_solve(app, context);
    arcsieve::cli::register_plot(app, context);
    arcsieve::cli::register_basis(app, context);
    arcsieve::cli::register_locate(app, context);
    try {
        app.parse(argc, argv);
    } catch (const CLI::ParseError& error) {
        const int code = app.exit(error);
        return code == 0 ? 0 : 2;
    } catch (const arcsieve::InputError& error) {
        std::cerr << "arcsieve: error: " << error.what() << "\n";
        return 2;
    } catch (const std::exception& error) {
        std::cerr << "arcsieve: internal error: " << error.what() << "\n";
        return 3;
    }
    return context.exit_code;
}
