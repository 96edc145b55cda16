#pragma once
// A dispersion-formula file (io/dispersion_file.hpp) as a Material, so that a
// scene may name it wherever it names an n, k table: `material = "ito_1e20"`
// (materials/formulas/ito_1e20.toml) or a path to a `.toml` file.
//
// Input: the formula file. Output: the formula sampled every 1 nm over its
// wavelength range (optics/dispersion.hpp, formula_material), linearly
// interpolated between samples like a table; name = file stem, source says
// the formula, the sampling and the parameters' source.
// Errors: MaterialError with the reader's "FILE:LINE:COL: key ..." message.
#include <filesystem>

#include "optics/material.hpp"

namespace lumtrap {

/// Sampling step of formula materials (nm).
inline constexpr double kFormulaSampleStepNm = 1.0;

Material formula_file_material(const std::filesystem::path& file);

/// Installs formula_file_material as optics' formula loader
/// (set_formula_file_loader); the scene reader and `lumtrap materials` do.
void install_formula_file_reader();

}  // namespace lumtrap
