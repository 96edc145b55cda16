// The registry of textures and the helpers that work from a descriptor
// alone. See texture_descriptor.hpp.
#include <algorithm>
#include <stdexcept>

#include "geometry/texture_descriptor.hpp"

namespace lumtrap::geometry {

// Each texture's file defines its descriptor; one line here registers it.
extern const TextureDescriptor kPlanarTexture;
extern const TextureDescriptor kUprightPyramidsTexture;
extern const TextureDescriptor kInvertedPyramidsTexture;
extern const TextureDescriptor kRandomPyramidsTexture;
extern const TextureDescriptor kRandomInvertedPyramidsTexture;
extern const TextureDescriptor kHeightMapTexture;

std::span<const TextureDescriptor* const> texture_descriptors() {
  static const TextureDescriptor* const all[] = {
      &kPlanarTexture,
      &kUprightPyramidsTexture,
      &kInvertedPyramidsTexture,
      &kRandomPyramidsTexture,
      &kRandomInvertedPyramidsTexture,
      &kHeightMapTexture,
  };
  return all;
}

const TextureDescriptor* find_texture(std::string_view kind) {
  for (const TextureDescriptor* d : texture_descriptors())
    if (d->kind == kind) return d;
  return nullptr;
}

const TextureDescriptor& texture_of(const TextureParams& params) {
  const TextureDescriptor* d = find_texture(params.kind);
  if (!d) throw std::invalid_argument("unknown texture kind \"" + params.kind + "\"");
  return *d;
}

double TextureParams::number(std::string_view key) const {
  auto it = numbers.find(key);
  if (it == numbers.end()) throw std::out_of_range("texture \"" + kind + "\" has no value for '" + std::string(key) + "'");
  return it->second;
}

const std::string& TextureParams::word(std::string_view key) const {
  auto it = words.find(key);
  if (it == words.end()) throw std::out_of_range("texture \"" + kind + "\" has no word for '" + std::string(key) + "'");
  return it->second;
}

bool TextureParams::has(std::string_view key) const { return numbers.count(key) || words.count(key); }

bool param_applies(const ParamSpec& spec, const TextureParams& params) {
  if (spec.when_key.empty()) return true;
  auto it = params.words.find(spec.when_key);
  return it != params.words.end() &&
         std::find(spec.when_words.begin(), spec.when_words.end(), it->second) != spec.when_words.end();
}

TextureParams default_texture(std::string_view kind) {
  TextureParams p;
  p.kind = std::string(kind);
  const TextureDescriptor* d = find_texture(kind);
  if (!d) throw std::invalid_argument("unknown texture kind \"" + p.kind + "\"");
  for (const ParamSpec& s : d->params) {
    if (s.required || !param_applies(s, p)) continue;
    if (s.kind == ParamKind::word || s.kind == ParamKind::file_path)
      p.words[std::string(s.key)] = std::string(s.fallback_word);
    else
      p.numbers[std::string(s.key)] = s.fallback;
  }
  return p;
}

TileMesh build_texture(const TextureParams& params) { return texture_of(params).build(params); }

}  // namespace lumtrap::geometry
