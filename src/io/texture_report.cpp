// Files of `lumtrap texture` for one surface. See texture_report.hpp.
#include "io/texture_report.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <nlohmann/json.hpp>

namespace lumtrap {

namespace {

constexpr const char* kNote =
    "statistics of the model surface lumtrap builds from the scene (model geometry, not a measurement)";

struct Spread {
  double mean = 0, sd = 0, min = 0, max = 0;
};

template <class Get>
Spread spread_of(const std::vector<geometry::FoundPyramid>& ps, Get get) {
  Spread s;
  if (ps.empty()) return s;
  s.min = s.max = get(ps[0]);
  for (const auto& p : ps) {
    s.mean += get(p);
    s.min = std::min(s.min, get(p));
    s.max = std::max(s.max, get(p));
  }
  s.mean /= double(ps.size());
  for (const auto& p : ps) s.sd += (get(p) - s.mean) * (get(p) - s.mean);
  s.sd = ps.size() > 1 ? std::sqrt(s.sd / double(ps.size() - 1)) : 0.0;
  return s;
}

nlohmann::ordered_json spread_json(const Spread& s) {
  return {{"mean", s.mean}, {"sd", s.sd}, {"min", s.min}, {"max", s.max}};
}

std::string g(double v) { return fmt::format("{:.10g}", v); }

}  // namespace

std::vector<OutputFile> texture_report_files(const TextureReportInput& in) {
  const geometry::TextureStatistics& s = in.statistics;
  const std::string p = in.surface + "_";
  std::vector<OutputFile> out;

  nlohmann::ordered_json j;
  j["note"] = kNote;
  j["surface"] = in.surface;
  j["texture"] = in.texture;
  j["tile_um"] = s.period_um;
  j["triangles"] = s.triangles;
  j["surface_area_ratio"] = s.surface_area_ratio;
  j["projected_flat_fraction"] = s.flat_fraction;
  j["flat_below_deg"] = s.flat_below_deg;
  j["mean_facet_angle_deg"] = s.mean_facet_deg;
  j["heights_um"] = {{"min", s.min_z_um}, {"max", s.max_z_um}, {"mean", s.mean_z_um},
                     {"Sq", s.sq_um},     {"Sa", s.sa_um},     {"Sz", s.sz_um}};
  nlohmann::ordered_json py;
  py["count"] = s.pyramids.size();
  py["per_mm2"] = s.pyramids_per_mm2;
  py["base_from_height_um"] = spread_json(spread_of(s.pyramids, [](const auto& x) { return x.base_from_height_um; }));
  py["visible_side_um"] = spread_json(spread_of(s.pyramids, [](const auto& x) { return x.visible_side_um; }));
  py["apex_height_um"] = spread_json(spread_of(s.pyramids, [](const auto& x) { return x.apex_z_um; }));
  j["pyramids"] = py;
  if (in.height_map) {
    const geometry::HeightMapReport& r = *in.height_map;
    const geometry::HeightMapPlan& pl = r.plan;
    nlohmann::ordered_json h;
    h["file_samples"] = {{"columns", r.file_columns}, {"rows", r.file_rows}};
    h["used_samples"] = {{"first_column", pl.rect.column}, {"first_row", pl.rect.row},
                         {"columns", pl.rect.columns},     {"rows", pl.rect.rows}};
    h["file_pixel_um"] = pl.file_pixel_um;
    h["pixel_size_from"] = pl.pixel_from_file ? "file" : "scene";
    h["map_samples_per_side"] = pl.map_samples;
    h["pitch_um"] = pl.pitch_um;
    h["removed_plane"] = {{"slope_x", r.removed_plane.slope_x}, {"slope_y", r.removed_plane.slope_y},
                          {"offset_um", r.removed_plane.offset_um}};
    h["tiling"] = std::string(geometry::tiling_word(r.tiling.method));
    h["tile_samples_per_side"] = pl.period_samples;
    h["tile_um"] = pl.period_um;
    switch (r.tiling.method) {
      case geometry::TilingMethod::mirror:
        h["tiling_note"] = "the map joined to its mirror images: the tile side is twice the map's";
        break;
      case geometry::TilingMethod::wrap:
        h["seam_rms_step_um"] = r.tiling.seam_rms_step;
        h["interior_rms_step_um"] = r.tiling.interior_rms_step;
        h["tiling_note"] = "the map taken as one period; compare the RMS step across the seam with the one inside";
        break;
      case geometry::TilingMethod::blend:
        h["blend_samples"] = r.tiling.blend_samples;
        h["blend_width_um"] = double(r.tiling.blend_samples) * pl.pitch_um;
        h["tiling_note"] = "opposite edges cross-faded over the blend width";
        break;
    }
    h["height_range_um"] = r.height_range_um;
    j["height_map"] = h;
  }
  j["images"] = {{"pixels_per_tile_side", in.image_pixels}, {"pixel_um", in.image_pixel_um}};
  out.push_back({p + "statistics.json", j.dump(2) + "\n"});

  std::string csv = fmt::format("# {}\nfacet angle from [deg],facet angle to [deg],surface area fraction,projected area fraction\n", kNote);
  for (const auto& b : s.facet_angles)
    csv += fmt::format("{},{},{},{}\n", g(b.from_deg), g(b.to_deg), g(b.surface_fraction), g(b.projected_fraction));
  out.push_back({p + "facet_angles.csv", csv});

  csv = fmt::format("# {}\nheight from [um],height to [um],projected area fraction\n", kNote);
  for (const auto& b : s.heights) csv += fmt::format("{},{},{}\n", g(b.from_um), g(b.to_um), g(b.projected_fraction));
  out.push_back({p + "heights.csv", csv});

  csv = fmt::format(
      "# {}\nx [um],y [um],apex height [um],prominence [um],facet angle [deg],projected area [um2],visible side "
      "[um],base from height [um]\n",
      kNote);
  for (const auto& q : s.pyramids)
    csv += fmt::format("{},{},{},{},{},{},{},{}\n", g(q.x_um), g(q.y_um), g(q.apex_z_um), g(q.prominence_um),
                       g(q.facet_deg), g(q.projected_area_um2), g(q.visible_side_um), g(q.base_from_height_um));
  out.push_back({p + "pyramids.csv", csv});

  csv = fmt::format("# {}\nsize from [um],size to [um],pyramids by base from height,pyramids by visible side\n", kNote);
  for (const auto& b : s.pyramid_sizes)
    csv += fmt::format("{},{},{},{}\n", g(b.from_um), g(b.to_um), b.by_base_from_height, b.by_visible_side);
  out.push_back({p + "pyramid_sizes.csv", csv});
  return out;
}

}  // namespace lumtrap
