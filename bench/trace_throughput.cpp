// Speed of the ray tracer against bare Embree, in one run, on the same mesh
// and with the same number of threads (a plain harness: each figure is the
// best of --repeat timed passes, wall clock, with the CPU time of the process
// beside it so that a loaded machine shows).
//
//   trace_throughput [--threads N] [--rays N] [--photons N] [--tile UM]
//                    [--big-tile UM] [--no-big | --big-only] [--repeat N] [--step NM]
//                    [--scene FILE] [--target MA_CM2]
//
// Sections:
//  1. per texture (regular upright pyramids; random pyramids on a --tile µm
//     tile; the demo cell's 40 µm random tile):
//     a. bare Embree: rtcIntersect1 on incoherent rays (origins uniform over
//        the tile on the zone's top or bottom plane, cosine-weighted
//        directions into the texture, half from each side), rays/s;
//     b. the tracer: every surface interaction the transport processes with
//        all the physics (WavelengthTally::interactions), per second, over
//        the demo cell's spectrum (300-1200 nm every --step nm, --photons per
//        wavelength); optical tables built before the clock starts;
//     c. their ratio; then the same at 1 thread (thread scaling).
//  2. cost of one random number, one stack-table lookup, the tables of one
//     wavelength;
//  2b. a precision run of --scene (default: the demo cell) to σ(J_G) <=
//     --target mA/cm² (photons per wavelength capped at 10^6), as lumtrap run
//     does it (prepare_run + drive_run): wall time, photons spent, σ reached;
//  3. (printed first) a --big-tile µm random tile: mesh and BVH build time,
//     peak resident memory (each measured in a fresh child process, so only
//     that build counts).
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <tbb/blocked_range.h>
#include <tbb/global_control.h>
#include <tbb/parallel_for.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <functional>
#include <random>
#include <string>
#include <vector>

#include <embree3/rtcore.h>

#include "io/scene_reader.hpp"
#include "io/scene_writer.hpp"
#include "trace/driver.hpp"
#include "trace/rng.hpp"
#include "trace/run.hpp"
#include "trace/sampling.hpp"

using namespace lumtrap;

namespace {

struct Options {
  int threads = 2;
  std::size_t rays = 2'000'000;
  std::uint64_t photons = 2000;
  double tile_um = 200;
  double big_tile_um = 1000;
  bool big = true;
  bool big_only = false;
  int repeat = 3;
  double step_nm = 10;
  std::string scene = std::filesystem::path(LUMTRAP_SOURCE_DIR) / "scenes" /
                      "k7_recipe_b_standard.toml";
  double target = 0.02;  // mA/cm², precision section
};

[[noreturn]] void usage(const char* msg) {
  std::fprintf(stderr,
               "%s\nusage: trace_throughput [--threads N] [--rays N] [--photons N] [--tile UM] "
               "[--big-tile UM] [--no-big | --big-only] [--repeat N] [--step NM] [--scene FILE]\n"
               "       [--target MA_CM2]\n",
               msg);
  std::exit(2);
}

Options parse(int argc, char** argv) {
  Options o;
  for (int i = 1; i < argc; ++i) {
    const std::string a = argv[i];
    auto value = [&]() -> std::string {
      if (i + 1 >= argc) usage(("missing value after " + a).c_str());
      return argv[++i];
    };
    if (a == "--threads") o.threads = std::stoi(value());
    else if (a == "--rays") o.rays = std::stoull(value());
    else if (a == "--photons") o.photons = std::stoull(value());
    else if (a == "--tile") o.tile_um = std::stod(value());
    else if (a == "--big-tile") o.big_tile_um = std::stod(value());
    else if (a == "--no-big") o.big = false;
    else if (a == "--big-only") o.big_only = true;
    else if (a == "--repeat") o.repeat = std::stoi(value());
    else if (a == "--step") o.step_nm = std::stod(value());
    else if (a == "--scene") o.scene = value();
    else if (a == "--target") o.target = std::stod(value());
    else if (a == "-h" || a == "--help") usage("");
    else usage(("unknown option " + a).c_str());
  }
  if (o.threads < 1 || o.rays < 1 || o.photons < 1 || o.repeat < 1 || !(o.tile_um > 0) || !(o.step_nm > 0))
    usage("threads, rays, photons, repeat, tile and step must be positive");
  return o;
}

double now_s() {
  return std::chrono::duration<double>(std::chrono::steady_clock::now().time_since_epoch()).count();
}

double cpu_s() {
  rusage u{};
  getrusage(RUSAGE_SELF, &u);
  return double(u.ru_utime.tv_sec + u.ru_stime.tv_sec) + 1e-6 * double(u.ru_utime.tv_usec + u.ru_stime.tv_usec);
}

struct Timing {
  double wall = 0, cpu = 0;
};

// Best (shortest wall) of `repeat` runs of f.
Timing best_of(int repeat, const std::function<void()>& f) {
  Timing best{1e300, 0};
  for (int r = 0; r < repeat; ++r) {
    const double w0 = now_s(), c0 = cpu_s();
    f();
    const double w = now_s() - w0, c = cpu_s() - c0;
    if (w < best.wall) best = {w, c};
  }
  return best;
}

// The demo cell's stack around a given front texture (TOML of [front.*]).
std::string cell_toml(const std::string& front_texture, double step_nm) {
  return R"(
[wafer]
material = "si_green2008"
thickness = "160 um"
)" + front_texture + R"(
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[[rear.films]]
material = "sio2_malitson1965"
thickness = "100 nm"
[illumination]
spectrum = "AM1.5G"
wavelengths = { from = "300 nm", to = "1200 nm", step = ")" +
         std::to_string(step_nm) + R"( nm" }
[run]
seed = 1
)";
}

std::string random_texture(double tile_um) {
  return "[front]\ntexture = \"random_pyramids\"\n[front.random_pyramids]\nmin = \"1 um\"\nmax = \"5 um\"\n"
         "tile = \"" +
         std::to_string(tile_um) + " um\"\nseed = 7\n";
}

const char* kUpright = "[front]\ntexture = \"upright_pyramids\"\n[front.pyramids]\nbase = \"5 um\"\n";

Scene scene_of(const std::string& toml_text, const std::string& name) {
  const auto dir = std::filesystem::temp_directory_path() / "lumtrap-bench";
  std::filesystem::create_directories(dir);
  const auto path = dir / (name + ".toml");
  std::ofstream(path) << toml_text;
  return parse_scene_file(path);
}

// Incoherent rays distributed like the tracer's: origins uniform over the
// tile on the zone's top plane (cosine-weighted about -z) or its bottom plane
// (cosine-weighted about +z), alternately.
std::vector<RTCRay> make_rays(const SurfaceModel& s, std::size_t n) {
  std::vector<RTCRay> rays(n);
  std::mt19937_64 gen(12345);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  for (std::size_t i = 0; i < n; ++i) {
    const bool down = (i & 1) == 0;
    const Eigen::Vector3d axis(0, 0, down ? -1.0 : 1.0);
    const Eigen::Vector3d d = cosine_weighted(axis, 1.0 - u(gen), 1.0 - u(gen));
    RTCRay& r = rays[i];
    r.org_x = float(s.period * u(gen));
    r.org_y = float(s.period * u(gen));
    r.org_z = float(down ? s.zone_hi : s.zone_lo);
    r.dir_x = float(d.x());
    r.dir_y = float(d.y());
    r.dir_z = float(d.z());
    r.tnear = 0.0f;
    r.tfar = std::numeric_limits<float>::infinity();
    r.mask = 0xFFFFFFFFu;
    r.flags = 0;
    r.time = 0.0f;
    r.id = unsigned(i);
  }
  return rays;
}

// Rays/s of rtcIntersect1 over `rays` on the current TBB arena.
struct EmbreeResult {
  double rays_per_s = 0, cpu_use = 0, hit_fraction = 0;
};

EmbreeResult bare_embree(const TileScene& scene, const std::vector<RTCRay>& rays, int repeat) {
  std::atomic<std::size_t> hits{0};
  const Timing t = best_of(repeat, [&] {
    hits = 0;
    tbb::parallel_for(tbb::blocked_range<std::size_t>(0, rays.size(), 4096),
                      [&](const tbb::blocked_range<std::size_t>& r) {
                        std::size_t h = 0;
                        RTCIntersectContext ctx;
                        rtcInitIntersectContext(&ctx);
                        for (std::size_t i = r.begin(); i < r.end(); ++i) {
                          RTCRayHit rh;
                          rh.ray = rays[i];
                          rh.hit.geomID = RTC_INVALID_GEOMETRY_ID;
                          rh.hit.instID[0] = RTC_INVALID_GEOMETRY_ID;
                          rtcIntersect1(scene.get(), &ctx, &rh);
                          h += rh.hit.geomID != RTC_INVALID_GEOMETRY_ID;
                        }
                        hits += h;
                      });
  });
  return {double(rays.size()) / t.wall, t.cpu / t.wall, double(hits) / double(rays.size())};
}

struct TracerResult {
  double interactions_per_s = 0, photons_per_s = 0, cpu_use = 0;
  std::uint64_t interactions = 0, photons = 0;
};

TracerResult tracer(const PreparedRun& run, const std::vector<WavelengthOptics>& optics, std::uint64_t photons,
                    int repeat) {
  std::uint64_t interactions = 0, traced = 0;
  const Timing t = best_of(repeat, [&] {
    interactions = traced = 0;
    for (std::size_t i = 0; i < optics.size(); ++i) {
      const WavelengthTally tally = trace_wavelength(run, optics[i], i, 0, photons);
      interactions += tally.interactions;
      traced += tally.photons;
    }
  });
  return {double(interactions) / t.wall, double(traced) / t.wall, t.cpu / t.wall, interactions, traced};
}

std::vector<WavelengthOptics> all_optics(const PreparedRun& run) {
  std::vector<WavelengthOptics> o;
  for (std::size_t i = 0; i < run.scene.illumination.wavelengths_nm.size(); ++i)
    o.push_back(wavelength_optics(run, i));
  return o;
}

struct Measured {
  EmbreeResult embree;
  TracerResult tracer;
  double tables_s = 1e300;
};

void texture_section(const char* label, const Scene& scene, const Options& o) {
  const double b0 = now_s();
  auto run = prepare_run(scene);
  const double build = now_s() - b0;
  std::printf("\n== %s: tile %.1f um, %zu triangles (prepare_run %.3f s)\n", label, run->model.front.period,
              run->model.front.mesh.triangles.size(), build);
  const auto rays = make_rays(run->model.front, o.rays);

  // The thread counts take turns, --repeat rounds, and each keeps its best
  // figures: a burst of load from other processes then spoils one round of
  // one count, not the comparison.
  std::vector<int> thread_counts{o.threads};
  if (o.threads != 1) thread_counts.push_back(1);
  std::vector<Measured> best(thread_counts.size());
  std::vector<WavelengthOptics> optics;
  for (int round = 0; round < o.repeat; ++round)
    for (std::size_t k = 0; k < thread_counts.size(); ++k) {
      tbb::global_control limit(tbb::global_control::max_allowed_parallelism, std::size_t(thread_counts[k]));
      const double t0 = now_s();
      optics = all_optics(*run);
      best[k].tables_s = std::min(best[k].tables_s, now_s() - t0);
      const EmbreeResult e = bare_embree(*run->front_scene, rays, 1);
      const TracerResult t = tracer(*run, optics, o.photons, 1);
      if (e.rays_per_s > best[k].embree.rays_per_s) best[k].embree = e;
      if (t.interactions_per_s > best[k].tracer.interactions_per_s) best[k].tracer = t;
    }
  for (std::size_t k = 0; k < thread_counts.size(); ++k) {
    const EmbreeResult& e = best[k].embree;
    const TracerResult& t = best[k].tracer;
    std::printf("  threads %d\n", thread_counts[k]);
    std::printf("    bare Embree   %10.3f Mrays/s          (%zu rays, %.0f%% hit, cpu use %.2f)\n",
                e.rays_per_s / 1e6, rays.size(), 100 * e.hit_fraction, e.cpu_use);
    std::printf("    tracer        %10.3f Minteractions/s  (%llu interactions, %llu photons, %.2f per photon, "
                "%.3f Mphotons/s, cpu use %.2f)\n",
                t.interactions_per_s / 1e6, (unsigned long long)t.interactions, (unsigned long long)t.photons,
                double(t.interactions) / double(t.photons), t.photons_per_s / 1e6, t.cpu_use);
    std::printf("    ratio tracer / Embree = %.3f\n", t.interactions_per_s / e.rays_per_s);
    std::printf("    optical tables: %zu wavelengths in %.3f s (%.2f ms each)\n", optics.size(), best[k].tables_s,
                1e3 * best[k].tables_s / double(optics.size()));
    const double trace_s = double(t.interactions) / t.interactions_per_s;
    std::printf("    with tables: %.3f Minteractions/s end to end at %llu photons per wavelength\n",
                double(t.interactions) / (trace_s + best[k].tables_s) / 1e6, (unsigned long long)o.photons);
  }
  if (thread_counts.size() == 2)
    std::printf("  scaling %d vs 1 thread: tracer %.2fx, Embree %.2fx, tables %.2fx\n", o.threads,
                best[0].tracer.interactions_per_s / best[1].tracer.interactions_per_s,
                best[0].embree.rays_per_s / best[1].embree.rays_per_s, best[1].tables_s / best[0].tables_s);
}

void micro_section(const Scene& scene, const Options& o) {
  std::printf("\n== micro costs (1 thread)\n");
  tbb::global_control limit(tbb::global_control::max_allowed_parallelism, 1);
  // Random numbers: a photon's stream (Philox4x64-10, 4 doubles per block).
  {
    const std::size_t photons = 1'000'000, per_photon = 16;
    double sink = 0;
    const Timing t = best_of(o.repeat, [&] {
      for (std::size_t i = 0; i < photons; ++i) {
        PhotonRng rng(1, 0, 3, i);
        for (std::size_t k = 0; k < per_photon; ++k) sink += rng.uniform();
      }
    });
    std::printf("  RNG: %.2f ns per number (streams of %zu numbers; checksum %.3f)\n",
                1e9 * t.wall / double(photons * per_photon), per_photon, sink);
  }
  auto run = prepare_run(scene);
  const std::size_t iw = run->scene.illumination.wavelengths_nm.size() / 2;
  {
    WavelengthOptics w;
    const Timing t = best_of(o.repeat, [&] { w = wavelength_optics(*run, iw); });
    std::printf("  optical tables of one wavelength (%.0f nm, 4 tables): %.2f ms\n",
                run->scene.illumination.wavelengths_nm[iw], 1e3 * t.wall);
    const StackTable& table = w.front.from_inside[0];  // has the critical-angle window
    std::vector<double> cosines(1 << 20);
    std::mt19937_64 gen(7);
    std::uniform_real_distribution<double> u(0.0, 1.0);
    for (double& c : cosines) c = u(gen);
    double sink = 0;
    const Timing tl = best_of(o.repeat, [&] {
      for (int rep = 0; rep < 8; ++rep)
        for (double c : cosines) sink += table.at(c).Rs;
    });
    std::printf("  stack-table lookup (at): %.2f ns (checksum %.3f)\n", 1e9 * tl.wall / double(8 * cosines.size()),
                sink);
    int isink = 0;
    const Timing tp = best_of(o.repeat, [&] {
      for (int rep = 0; rep < 8; ++rep)
        for (double c : cosines) isink += table.pick_absorbing_layer(c, 0.5, 0.5, c);
    });
    std::printf("  stack-table layer pick: %.2f ns (checksum %d)\n", 1e9 * tp.wall / double(8 * cosines.size()),
                isink);
  }
}

void precision_section(const Options& o) {
  std::printf("\n== precision run: %s, target sigma(J_G) %.3g mA/cm2\n", o.scene.c_str(), o.target);
  Scene scene = parse_scene_file(o.scene);
  scene.run.target_jg_error = o.target;
  scene.run.photons = 1'000'000;
  std::vector<int> thread_counts{o.threads};
  if (o.threads != 1) thread_counts.push_back(1);
  for (int th : thread_counts) {
    tbb::global_control limit(tbb::global_control::max_allowed_parallelism, std::size_t(th));
    std::uint64_t photons = 0;
    double sigma = 0;
    const Timing t = best_of(o.repeat, [&] {
      auto run = prepare_run(scene);
      const DriveResult r = drive_run(*run, DriveOptions{});
      photons = 0;
      for (const auto& w : r.tallies) photons += w.photons;
      sigma = r.jg_sigma_mA_cm2;
    });
    std::printf("  threads %d: %.3f s wall (setup, tables and tracing), %llu photons, sigma %.4f mA/cm2, "
                "cpu use %.2f\n",
                th, t.wall, (unsigned long long)photons, sigma, t.cpu / t.wall);
  }
}

// Runs f in a child process; returns the child's peak resident memory, MB.
double child_peak_mb(const std::function<void()>& f) {
  std::fflush(stdout);
  const pid_t pid = fork();
  if (pid == 0) {
    f();
    std::fflush(stdout);
    std::_Exit(0);
  }
  int status = 0;
  rusage ru{};
  wait4(pid, &status, 0, &ru);
  return double(ru.ru_maxrss) / 1024.0;
}

void big_section(const Options& o) {
  std::printf("\n== big random tile %.0f x %.0f um (%d threads; each step in a fresh child process)\n",
              o.big_tile_um, o.big_tile_um, o.threads);
  const Scene scene = scene_of(cell_toml(random_texture(o.big_tile_um), 100), "big");
  const double mb_mesh = child_peak_mb([&] {
    tbb::global_control limit(tbb::global_control::max_allowed_parallelism, std::size_t(o.threads));
    const double t0 = now_s();
    const geometry::TileMesh mesh = geometry::build_texture(scene.front.texture);
    const double t1 = now_s();
    EmbreeDevice dev;
    const double t2 = now_s();
    TileScene bvh(dev, mesh);
    const double t3 = now_s();
    std::printf("  mesh: %zu triangles, %zu vertices in %.3f s; BVH build %.3f s\n", mesh.triangles.size(),
                mesh.vertices.size(), t1 - t0, t3 - t2);
  });
  std::printf("  peak resident memory, mesh + BVH: %.0f MB\n", mb_mesh);
  const double mb_run = child_peak_mb([&] {
    tbb::global_control limit(tbb::global_control::max_allowed_parallelism, std::size_t(o.threads));
    const double t0 = now_s();
    auto run = prepare_run(scene);
    const double t1 = now_s();
    const WavelengthOptics optics = wavelength_optics(*run, 0);
    const WavelengthTally t = trace_wavelength(*run, optics, 0, 0, 20000);
    std::printf("  prepare_run (mesh, surface model, BVHs): %.3f s; 20000 photons traced, %llu interactions\n",
                t1 - t0, (unsigned long long)t.interactions);
  });
  std::printf("  peak resident memory, prepare_run + trace: %.0f MB\n", mb_run);
}

}  // namespace

int main(int argc, char** argv) {
  const Options o = parse(argc, argv);
  std::printf("trace_throughput: threads %d, rays %zu, photons %llu per wavelength, step %.0f nm, best of %d\n",
              o.threads, o.rays, (unsigned long long)o.photons, o.step_nm, o.repeat);
  // The big tile first: its builds run in forked children, and TBB's worker
  // threads do not survive a fork, so this process must not have started
  // them yet (a child would then build its BVH on one thread).
  if (o.big || o.big_only) big_section(o);
  if (o.big_only) return 0;
  const Scene upright = scene_of(cell_toml(kUpright, o.step_nm), "upright");
  const Scene random_tile = scene_of(cell_toml(random_texture(o.tile_um), o.step_nm), "random");
  const Scene demo_tile = scene_of(cell_toml(random_texture(40), o.step_nm), "demo");
  texture_section("regular upright pyramids, base 5 um", upright, o);
  texture_section("random pyramids 1-5 um", random_tile, o);
  texture_section("demo cell's random tile, 1-5 um", demo_tile, o);
  micro_section(demo_tile, o);
  precision_section(o);
  return 0;
}
