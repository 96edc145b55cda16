#pragma once
// `lumtrap sweep task --check`: can this machine (a compute node) run sweep
// tasks? Checks, in order, each a line of the report:
//   binary     the running binary and its version
//   libraries  the shared libraries lumtrap needs (Embree, TBB, OpenEXR,
//              fmt, ...) as loaded, with their paths (a missing one stops the
//              program before it starts: then the loader names it)
//   materials  where the shipped tables were found (material.hpp,
//              locate_materials) and that every table and the spectrum load
//   trace      a tiny planar scene (3 wavelengths x 4000 photons) traced with
//              Embree and TBB agrees with the exact planar solver within
//              5 sigma + 0.01 mA/cm2 (a model estimate against a model
//              estimate: it tests the installation, not the physics)
//   sweep      with a sweep folder: it is readable and writable, planned by
//              this version, and its first variant's scene rebuilds with the
//              planned identity; the binary and materials in the job
//              scripts are reported beside this process's
#include <filesystem>
#include <string>
#include <vector>

namespace lumtrap {

struct CheckLine {
  bool ok = true;
  std::string what;    ///< "binary", "libraries", ...
  std::string detail;
};

std::vector<CheckLine> node_check(const std::filesystem::path& sweep_dir = {});

}  // namespace lumtrap
