#include "cli/option_checks.hpp"

#include <fmt/format.h>

#include <charconv>
#include <cmath>

#include "io/toml_text.hpp"

namespace lumtrap::cli {

CLI::Validator whole_number_in(std::int64_t lo, std::int64_t hi, const std::string& note) {
  const std::string allowed =
      fmt::format("allowed: an integer from {} to {}{}", lo, hi, note.empty() ? "" : " (" + note + ")");
  return CLI::Validator(
      [lo, hi, allowed](std::string& text) -> std::string {
        const std::string_view s = trim_blanks(text);
        std::int64_t v = 0;
        auto [end, ec] = std::from_chars(s.data(), s.data() + s.size(), v);
        const bool digits = !s.empty() && s.find_first_not_of("+-0123456789") == std::string_view::npos;
        if (ec == std::errc::result_out_of_range || (digits && ec == std::errc() && end == s.data() + s.size() &&
                                                     (v < lo || v > hi)))
          return fmt::format("value {} is out of range; {}", message_excerpt(text), allowed);
        if (ec != std::errc() || end != s.data() + s.size() || !digits)
          return fmt::format("value {} is not an integer; {}", message_excerpt(text), allowed);
        return {};
      },
      fmt::format("INT in [{}, {}]", lo, hi));
}

CLI::Validator number_at_least(double lo) {
  return CLI::Validator(
      [lo](std::string& text) -> std::string {
        const std::string_view s = trim_blanks(text);
        double v = 0;
        auto [end, ec] = std::from_chars(s.data(), s.data() + s.size(), v);
        if (ec != std::errc() || end != s.data() + s.size() || !std::isfinite(v) || v < lo)
          return fmt::format("value {} is not allowed; allowed: a number >= {:g}", message_excerpt(text), lo);
        return {};
      },
      fmt::format("NUMBER >= {:g}", lo));
}

}  // namespace lumtrap::cli
