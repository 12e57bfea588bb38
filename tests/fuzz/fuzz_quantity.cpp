// libFuzzer target: the quantity parser (tipgap/units.hpp) for every dimension, plain and with an
// uncertainty. Property: it returns a finite SI value (sigma >= 0) or throws tipgap::error.
#include <cmath>
#include <cstdint>
#include <string_view>

#include "fuzz_common.hpp"
#include "tipgap/core/units.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    using namespace tipgap;
    const std::string_view text(reinterpret_cast<const char*>(data), size);
    const location where{"fuzz", 1, 1, "value"};
    for (dimension d : {dimension::length, dimension::energy, dimension::voltage, dimension::current,
                        dimension::temperature, dimension::area, dimension::resistance, dimension::conductance,
                        dimension::dimensionless}) {
        fuzz::expect_clean([&] {
            const double v = parse_quantity(text, d, where);
            if (!std::isfinite(v)) std::abort();
        });
        fuzz::expect_clean([&] {
            const uncertain u = parse_uncertain(text, d, where);
            if (!std::isfinite(u.value) || !std::isfinite(u.sigma) || u.sigma < 0) std::abort();
        });
    }
    fuzz::expect_clean([&] {
        if (!std::isfinite(parse_number(text, where))) std::abort();
    });
    return 0;
}
