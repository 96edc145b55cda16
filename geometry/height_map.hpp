#pragma once
// texture = "height_map": a measured (or computed) surface given as a grid
// of heights in a file, keys in [front.height_map] / [rear.height_map]
// (docs/scene-format.md lists them all).
//
// From file to tile, in this order (each step in its own file):
//   read the file (src/io, see below) → crop (a rectangle in samples or µm)
//   → bin (mean of bin × bin blocks) → heights × unit (µm) → level (remove
//   the least-squares plane, optional) → make periodic (mirror, wrap or
//   blend: height_map_periodic.hpp) → mesh (two triangles per cell, lowest
//   sample at z = 0: height_map_mesh.hpp).
//
// File I/O: geometry reads no files. The descriptor carries the file's
// absolute path (a file_path key), and its builder asks a loader that
// src/io installs (set_height_grid_loader; the scene reader does it). The
// loader returns the file's samples unscaled and may cache them, so that
// validating a scene (which reads the file to report its errors before any
// work starts) and building the mesh read a file once.
#include <cstddef>
#include <memory>
#include <optional>
#include <string>

#include "geometry/height_map_grid.hpp"
#include "geometry/height_map_periodic.hpp"
#include "geometry/mesh.hpp"
#include "geometry/texture_descriptor.hpp"

namespace lumtrap::geometry {

/// Which file, and how to read it.
struct HeightMapSource {
  std::string path;          ///< absolute
  std::string format;        ///< "csv_grid", "xyz" or "exr"
  double xy_unit_um = 1.0;   ///< xyz: µm per unit of the x and y columns
  bool operator==(const HeightMapSource&) const = default;
};

/// Reads a height-map file: samples in the file's height unit, and the
/// pixel size in µm when the file states it. Throws std::runtime_error whose
/// message names the file (and line) and what is wrong.
using HeightGridLoader = std::shared_ptr<const HeightGrid> (*)(const HeightMapSource&);

/// Installs the loader (src/io/height_map_file.hpp does, through
/// install_height_map_reader()).
void set_height_grid_loader(HeightGridLoader loader);

/// The installed loader's grid; std::logic_error when none is installed.
std::shared_ptr<const HeightGrid> load_height_grid(const HeightMapSource& source);

enum class CropMode { none, pixels, length };

/// The parameters of texture = "height_map" as plain values.
struct HeightMapSpec {
  HeightMapSource source;
  double height_unit_um = 1.0;  ///< µm per unit of the file's heights
  double pixel_size_um = 0;     ///< sample pitch; 0: the file's
  bool level = true;            ///< remove the least-squares plane
  CropMode crop = CropMode::none;
  PixelRect crop_pixels;        ///< CropMode::pixels
  double crop_x_um = 0, crop_y_um = 0, crop_width_um = 0, crop_height_um = 0;  ///< CropMode::length
  std::size_t bin = 1;
  TilingMethod tiling = TilingMethod::mirror;
  double seam_width_um = 0;     ///< blend only
  double max_triangles = 1.6e7; ///< refuse maps whose mesh would be larger (~2 GB)
};

HeightMapSpec height_map_spec(const TextureParams& params);

/// What the map becomes, found from the file's size and the spec alone.
struct HeightMapPlan {
  PixelRect rect;                  ///< samples of the file used (before binning)
  double file_pixel_um = 0;        ///< pitch of the file's samples
  bool pixel_from_file = false;    ///< the pitch is the file's own
  std::size_t map_samples = 0;     ///< n: per side after cropping and binning
  double pitch_um = 0;             ///< after binning
  std::size_t blend_samples = 0;   ///< blend: seam width in samples
  std::size_t period_samples = 0;  ///< M: per side of the periodic tile
  double period_um = 0;
  double triangles = 0;            ///< 2 M²
};

/// The plan, or what is wrong (naming the keys concerned, as the scene
/// reader reports it).
std::optional<ParamProblem> plan_height_map(const HeightGrid& file_grid, const HeightMapSpec& spec,
                                            HeightMapPlan& plan);

/// What the builder did, for the statistics command.
struct HeightMapReport {
  std::size_t file_columns = 0, file_rows = 0;
  HeightMapPlan plan;
  PlaneFit removed_plane;          ///< zero when level = false
  TilingReport tiling;             ///< steps in µm
  double height_range_um = 0;      ///< highest - lowest sample of the tile
};

/// The tile of a grid as read from a file (the file's units), following
/// `spec`; std::invalid_argument with the problem's text when the plan fails.
TileMesh height_map_tile(const HeightGrid& file_grid, const HeightMapSpec& spec, HeightMapReport* report = nullptr);

/// The same through the loader, from texture parameters.
TileMesh height_map_tile(const TextureParams& params, HeightMapReport* report = nullptr);

/// Bytes per triangle of a height-map tile while `lumtrap run` holds it:
/// the mesh (vertices and indices, ~24), the per-triangle normals and facet
/// classes (~26), Embree's vertex copy and bounding-volume hierarchy (~65),
/// the cached samples (~8). Measured peak resident memory / triangles:
/// 1951 MB for 1.568·10⁷ triangles (bench/height_map_size.cpp, README
/// "Measured surfaces"); used to say what a refused map would need.
inline constexpr double kHeightMapBytesPerTriangle = 125.0;

}  // namespace lumtrap::geometry
