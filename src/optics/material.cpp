// Optical constants: CSV tables of n(λ), k(λ), constant indices, and the
// lookup of a material by id or path. See material.hpp.
#include "optics/material.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <atomic>
#include <charconv>
#include <cmath>
#include <cstdlib>
#include <fstream>
#include <limits>
#include <mutex>
#include <string_view>
#include <system_error>

namespace lumtrap {

namespace {

constexpr std::string_view kSpectrumTableId = "astm_g173_03";  // not an n,k table
constexpr std::string_view kAirId = "air";

std::string_view trim(std::string_view s) {
  const auto blank = [](char c) { return c == ' ' || c == '\t' || c == '\r' || c == '\n'; };
  while (!s.empty() && blank(s.front())) s.remove_prefix(1);
  while (!s.empty() && blank(s.back())) s.remove_suffix(1);
  return s;
}

std::vector<std::string_view> split_cells(std::string_view line) {
  std::vector<std::string_view> cells;
  std::size_t start = 0;
  while (true) {
    const std::size_t comma = line.find(',', start);
    if (comma == std::string_view::npos) {
      cells.push_back(trim(line.substr(start)));
      return cells;
    }
    cells.push_back(trim(line.substr(start, comma - start)));
    start = comma + 1;
  }
}

std::string join(const std::vector<std::string>& parts, std::string_view sep) {
  std::string out;
  for (std::size_t i = 0; i < parts.size(); ++i) {
    if (i) out += sep;
    out += parts[i];
  }
  return out;
}

/// Parses the whole cell as a finite double (a leading '+' is accepted);
/// false for anything else, including "nan" and "inf".
bool parse_number(std::string_view cell, double& value) {
  if (!cell.empty() && cell.front() == '+') cell.remove_prefix(1);
  if (cell.empty()) return false;
  const char* first = cell.data();
  const char* last = cell.data() + cell.size();
  const auto [ptr, ec] = std::from_chars(first, last, value);
  return ec == std::errc() && ptr == last && std::isfinite(value);
}

[[noreturn]] void fail(const std::filesystem::path& file, int line, const std::string& what) {
  throw std::runtime_error(fmt::format("{}:{}: {}", file.string(), line, what));
}

}  // namespace

// ---------------------------------------------------------------------------
// CSV reading (shared with spectrum files)

namespace {

NumericTable parse_numeric_csv(const std::filesystem::path& file, const std::vector<std::string>& header);

/// Tables already read by this process, while their file is unchanged
/// (same size and modification time): a sweep of 10 000 variants validates
/// each against the same few tables.
struct CsvCache {
  struct Entry {
    std::string key;
    std::uintmax_t size;
    std::filesystem::file_time_type time;
    NumericTable table;
  };
  std::mutex mutex;
  std::vector<Entry> entries;  // few: the shipped tables and a user's own
};

CsvCache& csv_cache() {
  static CsvCache cache;
  return cache;
}

}  // namespace

NumericTable read_numeric_csv(const std::filesystem::path& file,
                              const std::vector<std::string>& header) {
  std::error_code ec1, ec2;
  const std::uintmax_t size = std::filesystem::file_size(file, ec1);
  const auto time = std::filesystem::last_write_time(file, ec2);
  if (ec1 || ec2) return parse_numeric_csv(file, header);  // the parser names the problem
  const std::string key = file.string() + "\n" + join(header, ",");
  CsvCache& cache = csv_cache();
  {
    const std::lock_guard lock(cache.mutex);
    for (const auto& e : cache.entries)
      if (e.key == key && e.size == size && e.time == time) return e.table;
  }
  NumericTable t = parse_numeric_csv(file, header);
  const std::lock_guard lock(cache.mutex);
  std::erase_if(cache.entries, [&](const CsvCache::Entry& e) { return e.key == key; });
  if (cache.entries.size() >= 64) cache.entries.erase(cache.entries.begin());
  cache.entries.push_back({key, size, time, t});
  return t;
}

namespace {

NumericTable parse_numeric_csv(const std::filesystem::path& file, const std::vector<std::string>& header) {
  const std::string columns_text = join(header, ",");
  std::ifstream in(file, std::ios::binary);
  if (!in) {
    throw std::runtime_error(fmt::format(
        "{}: cannot open the file (expected a `{}` CSV table)", file.string(), columns_text));
  }

  NumericTable table;
  table.columns.assign(header.size(), {});
  bool seen_non_comment = false;
  int line_no = 0;
  std::string raw;
  while (std::getline(in, raw)) {
    ++line_no;
    std::string_view line = raw;
    if (line_no == 1 && line.substr(0, 3) == "\xEF\xBB\xBF") line.remove_prefix(3);  // UTF-8 BOM
    line = trim(line);
    if (line.empty()) continue;
    if (line.front() == '#') {
      if (table.source.empty()) {
        std::string_view body = trim(line.substr(1));
        constexpr std::string_view tag = "source:";
        if (body.substr(0, tag.size()) == tag) table.source = std::string(trim(body.substr(tag.size())));
      }
      continue;
    }

    const std::vector<std::string_view> cells = split_cells(line);
    const bool first_non_comment = !seen_non_comment;
    seen_non_comment = true;
    if (first_non_comment && cells.size() == header.size() &&
        std::equal(cells.begin(), cells.end(), header.begin())) {
      continue;  // the optional header line
    }

    if (cells.size() != header.size()) {
      fail(file, line_no,
           fmt::format("expected {} columns `{}`, found {} in \"{}\"", header.size(), columns_text,
                       cells.size(), line));
    }
    std::vector<double> row(header.size());
    for (std::size_t c = 0; c < cells.size(); ++c) {
      if (!parse_number(cells[c], row[c])) {
        fail(file, line_no,
             fmt::format("{} cell \"{}\" is not a finite number; a data row is {} numbers `{}`{}",
                         header[c], cells[c], header.size(), columns_text,
                         first_non_comment
                             ? fmt::format(" (a header line must read exactly `{}`)", columns_text)
                             : std::string()));
      }
    }
    if (!(row[0] > 0.0)) {
      fail(file, line_no,
           fmt::format("{} = {} must be > 0", header[0], cells[0]));
    }
    for (std::size_t c = 1; c < row.size(); ++c) {
      if (row[c] < 0.0) {
        fail(file, line_no, fmt::format("{} = {} is negative; {} must be >= 0", header[c], cells[c], header[c]));
      }
    }
    if (!table.line_of_row.empty()) {
      const double previous = table.columns[0].back();
      const int previous_line = table.line_of_row.back();
      if (row[0] == previous) {
        fail(file, line_no,
             fmt::format("duplicate {} {} (also on line {}); wavelengths must strictly increase",
                         header[0], cells[0], previous_line));
      }
      if (row[0] < previous) {
        fail(file, line_no,
             fmt::format("{} {} is smaller than {} on line {}; wavelengths must strictly increase",
                         header[0], cells[0], previous, previous_line));
      }
    }
    for (std::size_t c = 0; c < row.size(); ++c) table.columns[c].push_back(row[c]);
    table.line_of_row.push_back(line_no);
  }
  if (in.bad()) {
    throw std::runtime_error(fmt::format("{}: read error", file.string()));
  }
  if (table.line_of_row.empty()) {
    fail(file, std::max(line_no, 1),
         line_no == 0 ? fmt::format("the file is empty; expected `{}` data rows", columns_text)
                      : fmt::format("no data rows (end of file; only comments, blank lines or "
                                    "the header before); expected `{}` data rows",
                                    columns_text));
  }
  return table;
}

}  // namespace

// ---------------------------------------------------------------------------
// Material

cplx Material::index_at(double wl) const {
  if (constant) return {n.front(), k.front()};
  const double lo = wavelength_nm.front(), hi = wavelength_nm.back();
  if (!(wl >= lo && wl <= hi)) {  // also rejects NaN
    const std::string where = (!file.empty() && file != name) ? fmt::format(" ({})", file) : "";
    throw MaterialError(fmt::format("material '{}'{} covers {:g}–{:g} nm; {:g} nm requested", name,
                                    where, lo, hi, wl));
  }
  // Last grid point <= wl.
  const auto it = std::upper_bound(wavelength_nm.begin(), wavelength_nm.end(), wl);
  const std::size_t i = static_cast<std::size_t>(it - wavelength_nm.begin()) - 1;
  if (wavelength_nm[i] == wl) return {n[i], k[i]};  // exact at grid points
  const double t = (wl - wavelength_nm[i]) / (wavelength_nm[i + 1] - wavelength_nm[i]);
  return {n[i] + t * (n[i + 1] - n[i]), k[i] + t * (k[i + 1] - k[i])};
}

double Material::min_wavelength_nm() const {
  return constant ? -std::numeric_limits<double>::infinity() : wavelength_nm.front();
}

double Material::max_wavelength_nm() const {
  return constant ? std::numeric_limits<double>::infinity() : wavelength_nm.back();
}

Material load_material_file(const std::filesystem::path& file) {
  NumericTable t;
  try {
    t = read_numeric_csv(file, {"wavelength_nm", "n", "k"});
  } catch (const std::runtime_error& e) {
    throw MaterialError(e.what());
  }
  for (std::size_t r = 0; r < t.line_of_row.size(); ++r) {
    if (!(t.columns[1][r] > 0.0)) {
      throw MaterialError(fmt::format("{}:{}: n = {:g}; the real part n must be > 0",
                                      file.string(), t.line_of_row[r], t.columns[1][r]));
    }
  }
  Material m;
  m.name = file.stem().string();
  m.source = t.source;
  m.file = file.string();
  m.wavelength_nm = std::move(t.columns[0]);
  m.n = std::move(t.columns[1]);
  m.k = std::move(t.columns[2]);
  return m;
}

Material constant_material(double n, double k) {
  if (!(std::isfinite(n) && n > 0.0) || !(std::isfinite(k) && k >= 0.0)) {
    throw MaterialError(fmt::format(
        "constant index n = {:g}, k = {:g} is not allowed; n must be > 0 and k >= 0", n, k));
  }
  Material m;
  m.name = fmt::format("n={:g},k={:g}", n, k);
  m.source = "constant";
  m.wavelength_nm = {0.0};
  m.n = {n};
  m.k = {k};
  m.constant = true;
  return m;
}

namespace {

/// The folder of the running executable ("" when /proc/self/exe cannot be read).
std::filesystem::path executable_dir() {
  static const std::filesystem::path dir = [] {
    std::error_code ec;
    const std::filesystem::path exe = std::filesystem::read_symlink("/proc/self/exe", ec);
    return ec ? std::filesystem::path() : exe.parent_path();
  }();
  return dir;
}

/// The folder found beside the binary (found once: it does not move while
/// the process runs), and how.
const MaterialsLocation& materials_beside_binary() {
  static const MaterialsLocation found = [] {
    const std::filesystem::path exe_dir = executable_dir();
    std::vector<std::filesystem::path> candidates;
    if (!exe_dir.empty()) {
      candidates.push_back((exe_dir / ".." / "share" / "lumtrap" / "materials").lexically_normal());  // installed
      candidates.push_back(exe_dir / "share" / "lumtrap" / "materials");                             // build tree
    }
    std::error_code ec;
    for (std::size_t i = 0; i < candidates.size(); ++i)
      if (std::filesystem::is_directory(candidates[i], ec))
        return MaterialsLocation{candidates[i], i == 0 ? "installed beside the binary" : "build tree"};
    std::string looked;
    for (const auto& c : candidates) looked += (looked.empty() ? "" : ", ") + c.string();
    return MaterialsLocation{
        candidates.empty() ? std::filesystem::path("materials") : candidates.front(),
        fmt::format("not found (looked in {})", looked.empty() ? std::string("nothing: /proc/self/exe unreadable")
                                                                 : looked)};
  }();
  return found;
}

}  // namespace

MaterialsLocation locate_materials() {
  if (const char* env = std::getenv("LUMTRAP_MATERIALS"); env != nullptr && *env != '\0')
    return {std::filesystem::path(env), "LUMTRAP_MATERIALS"};
  return materials_beside_binary();
}

std::filesystem::path materials_dir() { return locate_materials().dir; }

std::vector<std::string> shipped_material_ids() {
  std::vector<std::string> ids;
  std::error_code ec;
  const std::filesystem::path dir = materials_dir();
  for (std::filesystem::directory_iterator it(dir, ec), end; !ec && it != end; it.increment(ec)) {
    const std::filesystem::path& p = it->path();
    if (p.extension() != ".csv" || !it->is_regular_file(ec)) continue;
    std::string stem = p.stem().string();
    if (stem == kSpectrumTableId) continue;
    ids.push_back(std::move(stem));
  }
  std::sort(ids.begin(), ids.end());
  return ids;
}

namespace {

std::atomic<FormulaFileLoader> g_formula_loader{nullptr};

bool is_formula_file(const std::filesystem::path& p) { return p.extension() == ".toml"; }

Material load_table_or_formula(const std::filesystem::path& p) {
  if (!is_formula_file(p)) return load_material_file(p);
  const FormulaFileLoader loader = g_formula_loader.load();
  if (!loader)
    throw MaterialError(fmt::format("{}: dispersion-formula files are read through src/io, whose reader is "
                                    "not installed in this program",
                                    p.string()));
  return loader(p);
}

}  // namespace

void set_formula_file_loader(FormulaFileLoader loader) { g_formula_loader.store(loader); }

std::vector<std::string> shipped_formula_ids() {
  std::vector<std::string> ids;
  std::error_code ec;
  const std::filesystem::path dir = materials_dir() / "formulas";
  for (std::filesystem::directory_iterator it(dir, ec), end; !ec && it != end; it.increment(ec)) {
    const std::filesystem::path& p = it->path();
    if (!is_formula_file(p) || !it->is_regular_file(ec)) continue;
    ids.push_back(p.stem().string());
  }
  std::sort(ids.begin(), ids.end());
  return ids;
}

Material find_material(const std::string& id_or_path, const std::filesystem::path& relative_to) {
  const std::string ref(trim(id_or_path));
  if (ref == kAirId) {
    Material air = constant_material(1.0, 0.0);
    air.name = std::string(kAirId);
    air.source = "built-in constant n = 1, k = 0";
    return air;
  }

  const std::filesystem::path dir = materials_dir();
  const auto is_id = [](const std::string& s) {
    return !s.empty() && std::all_of(s.begin(), s.end(), [](char c) {
      return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') ||
             c == '_' || c == '-';
    });
  };
  if (ref == kSpectrumTableId) {
    throw MaterialError(fmt::format(
        "'{}' is the solar spectrum table, not an optical-constants (n, k) material", ref));
  }
  std::error_code ec;
  if (is_id(ref)) {
    const std::filesystem::path shipped = dir / (ref + ".csv");
    if (std::filesystem::is_regular_file(shipped, ec)) {
      Material m = load_material_file(shipped);
      m.name = ref;
      return m;
    }
    const std::filesystem::path formula = dir / "formulas" / (ref + ".toml");
    if (std::filesystem::is_regular_file(formula, ec)) {
      Material m = load_table_or_formula(formula);
      m.name = ref;
      return m;
    }
  }

  if (!ref.empty()) {
    std::filesystem::path p(ref);
    if (p.is_relative() && !relative_to.empty()) p = relative_to / p;
    const auto st = std::filesystem::status(p, ec);
    if (std::filesystem::is_regular_file(st)) {
      Material m = load_table_or_formula(p);
      m.name = ref;
      return m;
    }
    if (std::filesystem::is_directory(st))
      throw MaterialError(fmt::format("{} is a folder, not a table; allowed: a `wavelength_nm,n,k` CSV file or a dispersion-formula .toml", p.string()));
    if (std::filesystem::exists(st))
      throw MaterialError(fmt::format("{} is not a regular file (a pipe, device or socket); allowed: a "
                                      "`wavelength_nm,n,k` CSV file or a dispersion-formula .toml",
                                      p.string()));
  }

  std::vector<std::string> known = shipped_material_ids();
  known.insert(known.begin(), std::string(kAirId));
  for (std::string& f : shipped_formula_ids()) known.push_back(std::move(f) + " (formula)");
  std::string looked_in = fmt::format("no shipped table {}/{}.csv", dir.string(), ref);
  if (const MaterialsLocation loc = locate_materials(); loc.how.rfind("not found", 0) == 0)
    looked_in += fmt::format(" (the shipped materials folder was {}; set LUMTRAP_MATERIALS to it)", loc.how);
  else if (loc.how == "LUMTRAP_MATERIALS" && !std::filesystem::is_directory(loc.dir, ec))
    looked_in += fmt::format(" (LUMTRAP_MATERIALS = {} is not a folder)", loc.dir.string());
  if (!is_id(ref)) {
    std::filesystem::path p(ref);
    if (p.is_relative() && !relative_to.empty()) p = relative_to / p;
    looked_in = fmt::format("no file {}", p.string());
  } else {
    std::filesystem::path p(ref);
    if (!relative_to.empty()) p = relative_to / p;
    looked_in += fmt::format(" and no file {}", p.string());
  }
  throw MaterialError(fmt::format(
      "unknown material '{}' ({}); known ids: {}; or give a path to a `wavelength_nm,n,k` CSV "
      "file or a dispersion-formula .toml file, or a constant index {{ n = ..., k = ... }}",
      ref, looked_in, join(known, ", ")));
}

}  // namespace lumtrap
