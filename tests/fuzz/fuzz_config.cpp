// libFuzzer target: the YAML configuration loader (tipgap/config.hpp). Property: it returns a
// configuration that passes validation or throws tipgap::error; yaml-cpp's own exceptions must not
// escape.
#include <cstdint>
#include <string_view>

#include "fuzz_common.hpp"
#include "tipgap/config/config.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string_view text(reinterpret_cast<const char*>(data), size);
    tipgap::fuzz::expect_clean([&] {
        tipgap::config c = tipgap::parse_config(text, "fuzz.yaml");
        // What the loader accepts is inside the validated domain.
        c.model.validate();
        c.geometry.validate();
    });
    return 0;
}
