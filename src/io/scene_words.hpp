#pragma once
// The words of the scene format's enumerations (docs/scene-format.md),
// shared by the scene reader, the resolved-scene writer and the summary.
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "io/scene.hpp"

namespace lumtrap {

template <class E>
using Words = std::vector<std::pair<std::string_view, E>>;

inline const Words<Conformality> kConformalityWords = {{"conformal", Conformality::conformal},
                                                       {"directional", Conformality::directional}};
inline const Words<SurfaceScattering> kScatteringWords = {{"specular", SurfaceScattering::specular},
                                                          {"lambertian", SurfaceScattering::lambertian},
                                                          {"mixed", SurfaceScattering::mixed}};
inline const Words<InterfaceModel> kInterfaceWords = {{"films", InterfaceModel::films},
                                                      {"ideal", InterfaceModel::ideal}};
inline const Words<RearPatternLayout> kPatternLayoutWords = {{"lines", RearPatternLayout::lines},
                                                           {"dots", RearPatternLayout::dots}};
inline const Words<DotLattice> kDotLatticeWords = {{"square", DotLattice::square},
                                                   {"hexagonal", DotLattice::hexagonal}};
inline const Words<FingerShape> kFingerShapeWords = {{"rectangle", FingerShape::rectangle},
                                                    {"half_ellipse", FingerShape::half_ellipse},
                                                    {"round_wire", FingerShape::round_wire}};
inline const Words<bool> kPolarizationTrackingWords = {{"tracked", true}, {"averaged", false}};
inline const Words<ThicknessConvention> kConventionWords = {{"mean", ThicknessConvention::mean},
                                                            {"base", ThicknessConvention::base},
                                                            {"apex", ThicknessConvention::apex}};
inline const Words<IlluminationKind> kIlluminationWords = {{"collimated", IlluminationKind::collimated},
                                                           {"diffuse", IlluminationKind::diffuse}};
inline const Words<PolarizationKind> kPolarizationWords = {{"unpolarized", PolarizationKind::unpolarized},
                                                           {"s", PolarizationKind::s},
                                                           {"p", PolarizationKind::p}};
inline const Words<SpectrumKind> kSpectrumWords = {{"AM1.5G", SpectrumKind::am15g},
                                                   {"AM1.5D", SpectrumKind::am15d},
                                                   {"AM0", SpectrumKind::am0}};

/// The word of a value ("?" when the table lacks it).
template <class E>
std::string_view word_of(E e, const Words<E>& words) {
  for (const auto& [w, v] : words)
    if (v == e) return w;
  return "?";
}

/// "\"a\", \"b\", \"c\"" for messages.
template <class E>
std::string word_list(const Words<E>& words) {
  std::string s;
  for (const auto& [w, v] : words) s += (s.empty() ? "\"" : ", \"") + std::string(w) + "\"";
  return s;
}

inline std::string thickness_convention_word(ThicknessConvention c) {
  return std::string(word_of(c, kConventionWords));
}

}  // namespace lumtrap
