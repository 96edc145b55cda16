// Writes a large height map (a single-channel OpenEXR image of n × n
// samples: upright {111} pyramids of 10 µm lattice with a 0.37-sample shift
// and 2 nm of pseudo-random noise, demo data of line K7, not a
// measurement) and a scene tracing it, to measure what a measured map
// costs: `lumtrap run` reports the setup time (reading, meshing, Embree
// build) and the peak resident memory in summary.json.
//
//   height_map_size N PITCH_UM TILING OUT_DIR
//   build/lumtrap run OUT_DIR/scene.toml -o OUT_DIR/run -j 2
//   grep -E '"(setup_seconds|peak_memory_MB)"' OUT_DIR/run/summary.json
//
// TILING is mirror (tile side 2(N - 1) samples) or wrap (N). The scene
// raises max_triangles so that nothing is refused; one wavelength, 1000
// photons, so that the run is mostly setup.
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "io/height_map_exr.hpp"

int main(int argc, char** argv) {
  if (argc != 5) {
    std::fprintf(stderr, "usage: height_map_size N PITCH_UM mirror|wrap OUT_DIR\n");
    return 2;
  }
  const long n = std::atol(argv[1]);
  const double pitch = std::atof(argv[2]);
  const std::string tiling = argv[3];
  const std::filesystem::path out = argv[4];
  if (n < 2 || !(pitch > 0) || (tiling != "mirror" && tiling != "wrap")) {
    std::fprintf(stderr, "height_map_size: N >= 2, PITCH_UM > 0, TILING mirror or wrap\n");
    return 2;
  }
  std::filesystem::create_directories(out);
  const double b = 10.0, t = std::sqrt(2.0), shift = 0.37 * pitch;
  std::vector<float> z(std::size_t(n) * std::size_t(n));
  std::uint64_t state = 7;
  for (long j = 0; j < n; ++j)
    for (long i = 0; i < n; ++i) {
      const auto d = [&](double u) {
        const double r = std::fmod(u - shift, b);
        return std::abs((r < 0 ? r + b : r) - 0.5 * b);
      };
      state = state * 6364136223846793005ull + 1442695040888963407ull;
      const double noise = 0.002 * (double(state >> 11) / double(1ull << 53) * 2 - 1);
      z[std::size_t(j) * std::size_t(n) + std::size_t(i)] =
          float(t * (0.5 * b - std::max(d(i * pitch), d(j * pitch))) + noise);
    }
  std::ofstream(out / "map.exr", std::ios::binary) << lumtrap::height_exr(int(n), int(n), z, pitch);
  std::ofstream(out / "scene.toml") << "# height_map_size: a large demo map (line K7, computed, not measured)\n"
                                    << "[wafer]\nthickness = \"180 um\"\n"
                                    << "[front]\ntexture = \"height_map\"\n[front.height_map]\n"
                                    << "file = \"map.exr\"\nformat = \"exr\"\nheight_unit = \"um\"\nlevel = \"none\"\n"
                                    << "tiling = \"" << tiling << "\"\nmax_triangles = 4000000000\n"
                                    << "[illumination]\nwavelengths = \"1000 nm\"\n[run]\nphotons = 1000\n";
  const double m = tiling == "mirror" ? 2.0 * double(n - 1) : double(n);
  std::printf("%s: %ld × %ld samples at %g um (%g um square), tiling %s: %.0f triangles\n", out.c_str(), n, n, pitch,
              double(n) * pitch, tiling.c_str(), 2 * m * m);
  return 0;
}
