#include "io/toml_text.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <sstream>

#include "io/units.hpp"

namespace lumtrap {

std::string toml_quote(std::string_view s) {
  std::string out = "\"";
  for (char c : s) {
    switch (c) {
      case '"': out += "\\\""; break;
      case '\\': out += "\\\\"; break;
      case '\n': out += "\\n"; break;
      case '\t': out += "\\t"; break;
      case '\r': out += "\\r"; break;
      case '\b': out += "\\b"; break;
      case '\f': out += "\\f"; break;
      default:
        if (static_cast<unsigned char>(c) < 0x20 || c == 0x7F)
          out += fmt::format("\\u{:04X}", static_cast<unsigned>(static_cast<unsigned char>(c)));
        else
          out += c;
    }
  }
  return out + "\"";
}

std::string toml_float_text(double x) {
  if (std::isnan(x)) return "nan";
  if (std::isinf(x)) return x > 0 ? "inf" : "-inf";
  std::string s = format_number(x);
  if (s.find_first_of(".eE") == std::string::npos) s += ".0";
  return s;
}

std::string toml_value_text(const toml::node& n, std::size_t max_items) {
  if (auto* s = n.as_string()) return toml_quote(s->get());
  if (auto* i = n.as_integer()) return std::to_string(i->get());
  if (auto* f = n.as_floating_point()) return toml_float_text(f->get());
  if (auto* b = n.as_boolean()) return b->get() ? "true" : "false";
  if (auto* a = n.as_array()) {
    std::string s = "[";
    for (std::size_t i = 0; i < a->size(); ++i) {
      if (i == max_items) {
        s += ", ...";
        break;
      }
      s += (i ? ", " : "") + toml_value_text(*a->get(i), max_items);
    }
    return s + "]";
  }
  if (auto* t = n.as_table()) {
    std::string s = "{";
    bool first = true;
    for (auto&& [k, v] : *t) {
      const std::string key(k.str());
      s += (first ? " " : ", ") + (is_bare_key(key) ? key : toml_quote(key)) + " = " + toml_value_text(v, max_items);
      first = false;
    }
    return s + (first ? "}" : " }");
  }
  std::ostringstream os;  // dates and times
  if (auto* d = n.as_date()) os << *d;
  else if (auto* tm = n.as_time()) os << *tm;
  else if (auto* dt = n.as_date_time()) os << *dt;
  return os.str();
}

bool is_bare_key(std::string_view s) {
  return !s.empty() && std::all_of(s.begin(), s.end(), [](char c) {
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '_' || c == '-';
  });
}

std::string_view trim_blanks(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t')) s.remove_suffix(1);
  return s;
}

std::string toml_where(const std::filesystem::path& file, const toml::source_region& r) {
  if (r.begin.line == 0) return file.string();
  return fmt::format("{}:{}:{}", file.string(), r.begin.line, r.begin.column);
}

std::string_view toml_type_name(const toml::node& n) {
  if (n.is_string()) return "a string";
  if (n.is_integer()) return "an integer";
  if (n.is_floating_point()) return "a float";
  if (n.is_boolean()) return "a boolean";
  if (n.is_array()) return "an array";
  if (n.is_table()) return "a table";
  return "a date/time";
}

std::string toml_child_key(std::string_view path, std::string_view key) {
  return path.empty() ? std::string(key) : std::string(path) + "." + std::string(key);
}

std::string shortened(std::string_view text, std::size_t max) {
  if (text.size() <= max) return std::string(text);
  const auto continuation = [](char c) { return (static_cast<unsigned char>(c) & 0xC0) == 0x80; };
  std::size_t head = max * 2 / 3, tail = text.size() - max / 4;
  while (head > 0 && continuation(text[head])) --head;
  while (tail < text.size() && continuation(text[tail])) ++tail;
  return std::string(text.substr(0, head)) + "\u2026(" + std::to_string(text.size()) + " bytes)\u2026" +
         std::string(text.substr(tail));
}

std::string message_excerpt(std::string_view text, std::size_t max) { return toml_quote(shortened(text, max)); }

std::string quoted_word_list(const std::vector<std::string_view>& words) {
  std::string s;
  for (std::string_view w : words) s += (s.empty() ? "\"" : ", \"") + std::string(w) + "\"";
  return s;
}

}  // namespace lumtrap
