// lumtrap texture SCENE: statistics and pictures of the surfaces a scene
// builds (no rays), for comparison with an AFM, confocal or SEM analysis of
// the real sample. Files: io/texture_report.hpp, plus per surface
// <s>_relief_top.png, <s>_relief_45deg.png (shaded relief, 8-bit grey) and
// <s>_height.exr (heights in µm, readable as a height map), and the
// resolved scene.toml.
#include <fmt/format.h>

#include <iostream>

#include "cli/build_progress.hpp"
#include "cli/commands.hpp"
#include "cli/memory_limit.hpp"
#include "cli/output.hpp"
#include "cli/output_folder_lock.hpp"
#include "cli/output_path_check.hpp"
#include "io/stale_result_folders.hpp"
#include "geometry/height_map.hpp"
#include "geometry/relief_image.hpp"
#include "geometry/texture_statistics.hpp"
#include "io/height_map_exr.hpp"
#include "io/png_image.hpp"
#include "io/result_writer.hpp"
#include "io/scene_reader.hpp"
#include "io/scene_writer.hpp"
#include "io/texture_report.hpp"
#include "io/units.hpp"
#include "trace/build_estimate.hpp"

namespace lumtrap::cli {

namespace {

struct TextureOptions : OutputOptions {
  std::string surface = "both";
  std::string flat_below = "5 deg";
  std::string min_prominence = "0 um";
  int image_pixels = 1000;
  int image_tiles = 1;
  std::string max_memory;
};

/// A quantity option read with its unit; the message names the option.
template <class Parse>
double option_quantity(const std::string& name, const std::string& text, Parse parse, double lo, double hi,
                       const std::string& allowed) {
  double v = 0;
  try {
    v = parse(text);
  } catch (const UnitError& e) {
    throw std::runtime_error(fmt::format("option {}: {}", name, e.what()));
  }
  if (!(v >= lo && v <= hi))
    throw std::runtime_error(fmt::format("option {}: value \"{}\": out of range; allowed: {}", name, text, allowed));
  return v;
}

}  // namespace

void add_texture_command(CLI::App& app) {
  auto* cmd = app.add_subcommand(
      "texture", "statistics and pictures of the scene's surfaces (facet angles, heights, flat fraction, pyramids, "
                 "area ratio; shaded relief PNG, height EXR) into a folder");
  auto o = std::make_shared<TextureOptions>();
  cmd->add_option("scene", o->scene, "scene file (TOML)")->required()->check(CLI::ExistingFile);
  add_output_options(*cmd, *o);
  cmd->add_option("--surface", o->surface, "front, rear or both (default both)")
      ->check(CLI::IsMember({"front", "rear", "both"}));
  cmd->add_option("--flat-below", o->flat_below,
                  "triangles tilted less than this are flat ground (default \"5 deg\")");
  cmd->add_option("--min-prominence", o->min_prominence,
                  "a peak counts as a pyramid when it rises more than this above the saddle to a higher one "
                  "(default \"0 um\"; set it above the noise for measured maps)");
  cmd->add_option("--image-pixels", o->image_pixels, "pixels per tile side of the pictures (default 1000)")
      ->check(CLI::Range(1, 20000));
  cmd->add_option("--image-tiles", o->image_tiles, "tiles per side shown in the relief pictures (default 1)")
      ->check(CLI::Range(1, 16));
  add_max_memory_option(*cmd, o->max_memory);
  cmd->callback([o] {
    geometry::StatisticsOptions so;
    so.flat_below_deg = option_quantity("--flat-below", o->flat_below, parse_angle_deg, 0, 90,
                                        "an angle from 0 to 90 deg, e.g. \"5 deg\"");
    so.min_prominence_um = option_quantity("--min-prominence", o->min_prominence, parse_length_um, 0, 1e6,
                                           "a length >= 0, e.g. \"0.05 um\"");
    if (double(o->image_pixels) * o->image_tiles > 20000)
      throw std::runtime_error(fmt::format("options --image-pixels {} × --image-tiles {}: {} pixels across; allowed: "
                                           "at most 20000",
                                           o->image_pixels, o->image_tiles, o->image_pixels * o->image_tiles));
    const Scene scene = parse_scene_file(o->scene);
    const auto out = result_folder(*o, scene, "texture");
    check_output_folder(out, scene.file, o->overwrite);
    const MemoryLimit memory = memory_limit(o->max_memory);
    const BuildCost cost = estimate_build(scene);
    check_build_cost(scene, cost, memory.bytes, memory.origin);
    const BuildProgress building("lumtrap texture: building the textures", cost.seconds);

    std::vector<OutputFile> files;
    files.push_back({"scene.toml", resolved_scene_toml(scene)});
    for (const auto& [name, surface] : {std::pair{std::string("front"), &scene.front}, std::pair{std::string("rear"), &scene.rear}}) {
      if (o->surface != "both" && o->surface != name) continue;
      TextureReportInput in;
      in.surface = name;
      in.texture = surface->texture.kind;
      geometry::TileMesh mesh;
      if (surface->texture.kind == "height_map") {
        geometry::HeightMapReport report;
        mesh = geometry::height_map_tile(surface->texture, &report);
        in.height_map = report;
      } else {
        mesh = geometry::build_texture(surface->texture);
      }
      in.statistics = geometry::texture_statistics(mesh, so);
      in.image_pixels = o->image_pixels;
      in.image_pixel_um = mesh.period / o->image_pixels;
      for (auto& f : texture_report_files(in)) files.push_back(std::move(f));
      const auto top = geometry::relief_from_above(mesh, o->image_pixels, o->image_tiles);
      files.push_back({name + "_relief_top.png", png_grey_image(top.width, top.height, top.value)});
      const auto side = geometry::relief_oblique(mesh, o->image_pixels, o->image_tiles, 45.0);
      files.push_back({name + "_relief_45deg.png", png_grey_image(side.width, side.height, side.value)});
      const auto raster = geometry::height_raster(mesh, o->image_pixels);
      files.push_back({name + "_height.exr", height_exr(raster.pixels, raster.pixels, raster.z, raster.pixel_um)});

      const auto& s = in.statistics;
      std::cout << fmt::format("{} ({}): tile {:g} um, {} triangles\n", name, in.texture, s.period_um, s.triangles);
      if (in.height_map) {
        const auto& pl = in.height_map->plan;
        std::cout << fmt::format("  map {} × {} samples used of {} × {}, pitch {:g} um, tiling {} → tile {} samples{}\n",
                                 pl.map_samples, pl.map_samples, in.height_map->file_columns, in.height_map->file_rows,
                                 pl.pitch_um, geometry::tiling_word(in.height_map->tiling.method), pl.period_samples,
                                 in.height_map->tiling.method == geometry::TilingMethod::mirror
                                     ? " (mirrored: twice the map's side)"
                                     : "");
      }
      std::cout << fmt::format("  surface area ratio {:.4f}, projected flat fraction {:.4f} (below {:g} deg), mean "
                               "facet angle {:.2f} deg\n",
                               s.surface_area_ratio, s.flat_fraction, s.flat_below_deg, s.mean_facet_deg);
      std::cout << fmt::format("  heights: Sq {:.4g} um, Sa {:.4g} um, Sz {:.4g} um\n", s.sq_um, s.sa_um, s.sz_um);
      std::cout << fmt::format("  pyramids: {} ({:.4g} per mm2)\n", s.pyramids.size(), s.pyramids_per_mm2);
    }
    const OutputFolderLock lock(out);
    const auto tidied = tidy_stale_result_folders(out);
    for (const auto& note : tidied) std::cerr << "lumtrap: note: " << note << "\n";
    if (!tidied.empty()) check_output_folder(out, scene.file, o->overwrite);  // a result may have been put back
    write_result_folder(out, files, o->overwrite);
    std::cout << "(model geometry, not a measurement)\n";
    std::cout << "results in " << out.string() << "/\n";
  });
}

}  // namespace lumtrap::cli
