#include "tipgap/core/usage_message.hpp"

#include <fmt/format.h>
#include <string_view>

#include "tipgap/core/error.hpp"

namespace tipgap {

namespace {

bool starts_with(const std::string& s, std::string_view p) { return s.compare(0, p.size(), p) == 0; }
bool ends_with(const std::string& s, std::string_view p) {
    return s.size() >= p.size() && s.compare(s.size() - p.size(), p.size(), p) == 0;
}
// "name: rest" -> name and rest (name without spaces); false when the text is not of that form.
bool split_name(const std::string& s, std::string& name, std::string& rest) {
    const std::size_t colon = s.find(": ");
    if (colon == std::string::npos || colon == 0 || s.find(' ') < colon) return false;
    name = s.substr(0, colon);
    rest = s.substr(colon + 2);
    return true;
}

}  // namespace

std::string usage_message(const std::string& what, const usage_context& c) {
    const std::string help = fmt::format("see '{} --help'", c.command);
    // CLI11's wordings (CLI/Error.hpp, CLI/Validators.hpp of CLI11 2.1), matched as plain text.
    if (what == "A subcommand is required") {
        if (!c.remaining.empty()) {
            return fmt::format("{} is not a command; expected one of: {} (see 'tipgap --help')",
                               quote_input(c.remaining.front()), c.commands);
        }
        return fmt::format("no command given; expected one of: {} (see 'tipgap --help')", c.commands);
    }
    constexpr std::string_view is_required = " is required";
    if (ends_with(what, is_required) && what.find(' ') == what.size() - is_required.size()) {
        const std::string name = what.substr(0, what.size() - is_required.size());
        return fmt::format("{}: missing; expected {} ({})", name, c.option_usage(name), help);
    }
    for (std::string_view prefix : {"The following argument was not expected: ",
                                    "The following arguments were not expected: "}) {
        if (!starts_with(what, prefix)) continue;
        // CLI11 lists the extras last first; put them back in command-line order.
        std::vector<std::string> words;
        const std::string list = what.substr(prefix.size());
        for (std::size_t i = 0; i <= list.size();) {
            std::size_t sp = list.find(' ', i);
            if (sp == std::string::npos) sp = list.size();
            if (sp > i) words.insert(words.begin(), list.substr(i, sp - i));
            i = sp + 1;
        }
        std::string in_order;
        for (const auto& w : words) in_order += (in_order.empty() ? "" : " ") + w;
        return fmt::format("{} not understood; expected only the options and arguments listed by '{} --help'",
                           quote_input(in_order), c.command);
    }
    std::string name, rest;
    if (split_name(what, name, rest)) {
        // "--points: Value 1 not in range 2 to 1000000"
        const std::size_t in_range = rest.find(" not in range ");
        const std::size_t to = rest.rfind(" to ");
        if (starts_with(rest, "Value ") && in_range != std::string::npos && to != std::string::npos && to > in_range) {
            const std::string value = rest.substr(6, in_range - 6);
            const std::string lo = rest.substr(in_range + 14, to - in_range - 14);
            const std::string hi = rest.substr(to + 4);
            return fmt::format("{}: {} is not allowed; expected a number from {} to {} ({})", name, quote_input(value),
                               lo, hi, help);
        }
        // "--gap: 1 required TEXT missing"
        if (ends_with(rest, " missing") && rest.find(" required ") != std::string::npos) {
            return fmt::format("{}: the value is missing; expected {} ({})", name, c.option_usage(name), help);
        }
    }
    // "Could not convert: --confidence = abc"
    constexpr std::string_view convert = "Could not convert: ";
    if (starts_with(what, convert)) {
        const std::size_t eq = what.find(" = ", convert.size());
        if (eq != std::string::npos) {
            return fmt::format("{}: {} is not a valid value; expected a number ({})",
                               what.substr(convert.size(), eq - convert.size()), quote_input(what.substr(eq + 3)), help);
        }
    }
    // "The value abc is not an allowed value for --confidence"
    constexpr std::string_view value_prefix = "The value ";
    constexpr std::string_view not_allowed = " is not an allowed value for ";
    if (starts_with(what, value_prefix)) {
        const std::size_t at = what.rfind(not_allowed);
        if (at != std::string::npos && at >= value_prefix.size()) {
            return fmt::format("{}: {} is not a valid value; expected a number ({})",
                               what.substr(at + not_allowed.size()),
                               quote_input(what.substr(value_prefix.size(), at - value_prefix.size())), help);
        }
    }
    return fmt::format("{} ({})", what, help);
}

}  // namespace tipgap
