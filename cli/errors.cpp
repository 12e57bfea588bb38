#include "errors.hpp"

#include <cstdio>
#include <fmt/format.h>
#include <regex>
#include <vector>

namespace tipgap::cli {
namespace {

// "tipgap predict" for a failure inside `predict`, else "tipgap".
std::string command_name(const CLI::App& app) {
    for (const CLI::App* sub : app.get_subcommands()) return "tipgap " + sub->get_name();
    return "tipgap";
}

// "--gap VALUE" / "FILE...": how the option is written, from its type name when it has one.
std::string option_usage(const CLI::App& app, const std::string& name) {
    std::string type = "VALUE";
    for (const CLI::App* sub : app.get_subcommands()) {
        if (const CLI::Option* o = sub->get_option_no_throw(name)) {
            if (!o->get_type_name().empty() && o->get_type_name() != "TEXT") type = o->get_type_name();
            if (o->get_positional() && o->get_lnames().empty() && o->get_snames().empty()) return type;
        }
    }
    return name + " " + type;
}

std::string subcommand_list(const CLI::App& app) {
    std::string out;
    for (const CLI::App* sub : app.get_subcommands([](const CLI::App*) { return true; })) {
        if (sub->get_name().empty()) continue;
        out += (out.empty() ? "" : ", ") + sub->get_name();
    }
    return out;
}

}  // namespace

std::string one_line(std::string text) {
    for (char& c : text) {
        auto u = static_cast<unsigned char>(c);
        if (u < 0x20 || u == 0x7F) c = ' ';
    }
    return text;
}

std::string usage_message(const CLI::App& app, const CLI::ParseError& e) {
    const std::string what = e.what();
    const std::string help = fmt::format("see '{} --help'", command_name(app));
    std::smatch m;
    // CLI11's wordings (CLI/Error.hpp, CLI/Validators.hpp of CLI11 2.1), most specific first.
    if (what == "A subcommand is required") {
        const std::vector<std::string> rest = app.remaining();
        if (!rest.empty()) {
            return fmt::format("{} is not a command; expected one of: {} (see 'tipgap --help')",
                               quote_input(rest.front()), subcommand_list(app));
        }
        return fmt::format("no command given; expected one of: {} (see 'tipgap --help')", subcommand_list(app));
    }
    static const std::regex required(R"(^(\S+) is required$)");
    if (std::regex_match(what, m, required)) {
        return fmt::format("{}: missing; expected {} ({})", m[1].str(), option_usage(app, m[1].str()), help);
    }
    static const std::regex not_expected(R"(^The following arguments? (?:was|were) not expected: (.*)$)");
    if (std::regex_match(what, m, not_expected)) {
        // CLI11 lists the extras last first; put them back in command-line order.
        std::vector<std::string> words;
        const std::string list = m[1].str();
        for (std::size_t i = 0; i <= list.size();) {
            std::size_t sp = list.find(' ', i);
            if (sp == std::string::npos) sp = list.size();
            if (sp > i) words.insert(words.begin(), list.substr(i, sp - i));
            i = sp + 1;
        }
        std::string in_order;
        for (const auto& w : words) in_order += (in_order.empty() ? "" : " ") + w;
        return fmt::format("{} not understood; expected only the options and arguments listed by '{} --help'",
                           quote_input(in_order), command_name(app));
    }
    static const std::regex range(R"(^(\S+): Value (.*) not in range (\S+) to (\S+)$)");
    if (std::regex_match(what, m, range)) {
        return fmt::format("{}: {} is not allowed; expected a number from {} to {} ({})", m[1].str(),
                           quote_input(m[2].str()), m[3].str(), m[4].str(), help);
    }
    static const std::regex convert(R"(^Could not convert: (\S+) = (.*)$)");
    if (std::regex_match(what, m, convert)) {
        return fmt::format("{}: {} is not a valid value; expected a number ({})", m[1].str(), quote_input(m[2].str()),
                           help);
    }
    static const std::regex not_allowed(R"(^The value (.*) is not an allowed value for (\S+)$)");
    if (std::regex_match(what, m, not_allowed)) {
        return fmt::format("{}: {} is not a valid value; expected a number ({})", m[2].str(), quote_input(m[1].str()),
                           help);
    }
    static const std::regex missing_value(R"(^(\S+): \d+ required (\S+) missing$)");
    if (std::regex_match(what, m, missing_value)) {
        return fmt::format("{}: the value is missing; expected {} ({})", m[1].str(), option_usage(app, m[1].str()),
                           help);
    }
    return fmt::format("{} ({})", what, help);
}

int report_parse_error(const CLI::App& app, const CLI::ParseError& e) {
    std::fprintf(stderr, "tipgap: usage error: %s\n", one_line(usage_message(app, e)).c_str());
    return static_cast<int>(error_kind::usage);
}

int report_error(const tipgap::error& e) {
    const char* label = e.kind() == error_kind::usage       ? "usage error"
                        : e.kind() == error_kind::no_answer ? "no answer"
                                                            : "error";
    std::fprintf(stderr, "tipgap: %s: %s\n", label, one_line(e.what()).c_str());
    return static_cast<int>(e.kind());
}

int report_internal_error(const std::string& what) {
    std::fprintf(stderr, "tipgap: internal error (this is a bug; please report it with the command line): %s\n",
                 one_line(what).c_str());
    return internal_error_exit;
}

}  // namespace tipgap::cli
