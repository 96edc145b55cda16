// Checks of a compute node. See node_check.hpp.
#include "sweep/node_check.hpp"

#include <fmt/format.h>
#include <link.h>
#include <unistd.h>

#include <cmath>
#include <fstream>

#include "io/scene_identity.hpp"
#include "io/scene_reader.hpp"
#include "optics/material.hpp"
#include "optics/spectrum.hpp"
#include "sweep/plan_folder.hpp"
#include "trace/driver.hpp"
#include "trace/planar_run.hpp"
#include "trace/run.hpp"

namespace lumtrap {

namespace fs = std::filesystem;

namespace {

// A polished K7 wafer: 160 um, 75 nm SiNx, Al rear; three wavelengths.
const char* const kCheckScene = R"(
[wafer]
material = "si_green2008"
thickness = "160 um"

[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"

[rear]
medium = "al_rakic1995"

[illumination]
wavelengths = ["600 nm", "900 nm", "1050 nm"]

[run]
photons = 4000
)";

int add_library(dl_phdr_info* info, size_t, void* data) {
  auto* names = static_cast<std::vector<std::string>*>(data);
  const std::string path = info->dlpi_name ? info->dlpi_name : "";
  for (const char* want : {"embree", "tbb", "OpenEXR", "Imath", "Iex", "fmt", "tomlplusplus", "stdc++"})
    if (path.find(want) != std::string::npos) {
      names->push_back(path);
      break;
    }
  return 0;
}

CheckLine check_binary() {
  std::error_code ec;
  const fs::path exe = fs::read_symlink("/proc/self/exe", ec);
  return {true, "binary", fmt::format("lumtrap {} at {}", LUMTRAP_VERSION, ec ? "?" : exe.string())};
}

CheckLine check_libraries() {
  std::vector<std::string> libs;
  dl_iterate_phdr(add_library, &libs);
  std::string s;
  for (const auto& l : libs) s += (s.empty() ? "" : ", ") + l;
  return {true, "libraries", s.empty() ? "statically linked" : s};
}

CheckLine check_materials() {
  const MaterialsLocation loc = locate_materials();
  CheckLine c{true, "materials", fmt::format("{} ({})", loc.dir.string(), loc.how)};
  std::error_code ec;
  if (loc.how.rfind("not found", 0) == 0 || !fs::is_directory(loc.dir, ec)) {
    c.ok = false;
    c.detail += "; no such folder: set LUMTRAP_MATERIALS to PREFIX/share/lumtrap/materials of the install";
    return c;
  }
  std::size_t n = 0;
  try {
    for (const auto& id : shipped_material_ids()) {
      find_material(id);
      ++n;
    }
    builtin_spectrum("AM1.5G");
  } catch (const std::exception& e) {
    c.ok = false;
    c.detail += fmt::format("; {}", e.what());
    return c;
  }
  c.detail += fmt::format("; {} tables and the AM1.5G spectrum load", n);
  return c;
}

CheckLine check_trace() {
  CheckLine c{true, "trace", ""};
  try {
    const Scene scene = scene_from_table(toml::parse(kCheckScene), "<lumtrap check scene>");
    const auto run = prepare_run(scene);
    const DriveResult res = drive_run(*run, DriveOptions{});
    const Results traced = results_from_tallies(*run, res.tallies);
    const Results exact = planar_results(scene);
    const double d = traced.summary.J_G_mA_cm2 - exact.summary.J_G_mA_cm2;
    const double tol = 5 * traced.summary.J_G_sigma_mA_cm2 + 0.01;
    c.ok = std::abs(d) <= tol;
    c.detail = fmt::format("3 wavelengths x 4000 photons on a planar wafer: J_G traced {:.3f} +- {:.3f}, exact "
                           "{:.3f} mA/cm2 (model estimates; |difference| {:.3f} {} {:.3f})",
                           traced.summary.J_G_mA_cm2, traced.summary.J_G_sigma_mA_cm2, exact.summary.J_G_mA_cm2,
                           std::abs(d), c.ok ? "<=" : ">", tol);
  } catch (const std::exception& e) {
    c.ok = false;
    c.detail = e.what();
  }
  return c;
}

CheckLine check_sweep(const fs::path& dir) {
  CheckLine c{true, "sweep", dir.string()};
  try {
    const SweepFolder f = load_sweep_task(dir, 0);
    require_same_tool_version(f);
    const fs::path probe = f.dir / fmt::format(".check-{}-{}", ::getpid(), ::gethostid());
    {
      std::ofstream out(probe);
      if (!(out << "x")) throw std::runtime_error(fmt::format("cannot write into {}", f.dir.string()));
    }
    fs::remove(probe);
    const SweepFolderVariant& v = folder_variant(f, 0);
    std::vector<std::pair<std::string, std::string>> values;
    for (std::size_t k = 0; k < f.keys.size() && k < v.toml.size(); ++k) values.emplace_back(f.keys[k], v.toml[k]);
    const Scene scene = scene_from_table(variant_table(read_scene_table(f.dir / "sweep.toml"), values), f.source,
                                         {"sweep"});
    if (scene_identity(scene) != v.scene_hash)
      throw std::runtime_error(fmt::format("variant {} does not rebuild to its planned scene (identity {}, planned "
                                           "{}): a material or spectrum file changed",
                                           v.id, scene_identity(scene), v.scene_hash));
    c.detail += fmt::format(": {} variants, writable, variant {} rebuilds; job scripts run {} with materials {}",
                            f.variant_count, v.id, f.requests.value("lumtrap", std::string("?")),
                            f.requests.value("materials", std::string("?")));
  } catch (const std::exception& e) {
    c.ok = false;
    c.detail += fmt::format(": {}", e.what());
  }
  return c;
}

}  // namespace

std::vector<CheckLine> node_check(const fs::path& sweep_dir) {
  std::vector<CheckLine> out{check_binary(), check_libraries(), check_materials()};
  out.push_back(out.back().ok ? check_trace() : CheckLine{false, "trace", "skipped: no materials"});
  if (!sweep_dir.empty()) out.push_back(check_sweep(sweep_dir));
  return out;
}

}  // namespace lumtrap
