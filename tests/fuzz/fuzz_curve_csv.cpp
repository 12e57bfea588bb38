// libFuzzer target: the curve reader (tipgap/curve_io.hpp) with reader options taken from the
// input's last byte (delimiter, columns, flip_z, bias; fuzz_common.hpp), and the fitter on what it
// accepts.
// Property: the reader returns a curve whose values are finite, whose metadata values are in
// their ranges (|bias| <= 100 V, temperature in [0, 2000] K) and whose metadata and file name make
// valid JSON whatever their bytes (issue 11), with equal-length columns and
// sweeps that partition the rows, or throws tipgap::error; the fitter returns finite numbers (a
// positive decay constant) or throws tipgap::error.
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <string_view>

#include "fuzz_common.hpp"
#include "tipgap/io/columns.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/fit/fit.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    std::string_view text(reinterpret_cast<const char*>(data), size);
    const tipgap::reader_options options = tipgap::fuzz::options_from_last_byte(text, 2);
    tipgap::fuzz::expect_clean([&] {
        const tipgap::measured_curve c = tipgap::parse_curve_csv(text, "fuzz.csv", options);
        if (c.z_m.size() != c.current_A.size() || c.z_m.size() < 3) std::abort();
        for (std::size_t i = 0; i < c.z_m.size(); ++i) {
            if (!std::isfinite(c.z_m[i]) || !std::isfinite(c.current_A[i])) std::abort();
        }
        std::size_t rows = 0;
        for (const auto& s : c.sweeps) {
            if (s.z_m.size() != s.current_A.size() || s.first_row != rows) std::abort();
            rows += s.z_m.size();
        }
        if (rows != c.z_m.size()) std::abort();
        if (c.metadata.bias_V && !(std::abs(*c.metadata.bias_V) <= 100.0 * (1 + 1e-12))) std::abort();
        if (c.metadata.temperature_K && !(*c.metadata.temperature_K >= 0 && *c.metadata.temperature_K <= 2000.0 * (1 + 1e-12)))
            std::abort();
        // Any bytes in metadata keys and values: json_text replaces invalid UTF-8, never throws.
        tipgap::record meta;
        for (const auto& [key, value] : c.metadata.entries) meta.set(key, value);
        meta.set("file", std::string(text.substr(0, 40)));
        const std::string json = tipgap::json_text(meta);
        if (json.empty() || json.front() != '{') std::abort();
        // A curve the reader accepts goes on to the fitter: it must give finite numbers or refuse
        // with tipgap::error (a sweep that is too short, all below the noise floor, no spread in z).
        for (const tipgap::fit_result& r : tipgap::fit_curve(c, tipgap::fit_options{})) {
            if (!(r.decay_constant_per_m > 0.0) || !std::isfinite(r.decay_constant_per_m) || !std::isfinite(r.apparent_barrier_J) ||
                !std::isfinite(r.decay_constant_stderr_per_m)) {
                std::fprintf(stderr, "non-finite fit: kappa %g, phi %g, stderr %g\n", r.decay_constant_per_m,
                             r.apparent_barrier_J, r.decay_constant_stderr_per_m);
                std::abort();
            }
        }
    });
    return 0;
}
