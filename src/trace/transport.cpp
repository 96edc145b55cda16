#include "trace/transport.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <utility>

#include "trace/front_grid_hit.hpp"
#include "trace/polarization.hpp"
#include "trace/rng.hpp"
#include "trace/sampling.hpp"

namespace lumtrap {

namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr int kMaxWallCrossings = 100000;  // per zone traversal; beyond: lost

enum class Zone { front, rear, bulk_down, bulk_up };
enum class Medium { outside_front, silicon, outside_rear };
enum class ZoneExit { hit, top, bottom, lost };

struct Photon {
  Eigen::Vector3d p;  // position in the current zone's local frame (x, y in [0, period])
  Eigen::Vector3d d;  // unit direction
  Field E;            // unit complex field ⟂ d
  Zone zone = Zone::front;
  Medium medium = Medium::outside_front;
  bool entered = false;
  double optical_depth_left = 0;  // Beer-Lambert budget: absorbed when α·path exceeds it
  int interactions = 0;
  int passes = 0;
  std::uint32_t group = 0;  // paired group: photon index mod TallyLayout::photon_groups
  unsigned last_prim = RTC_INVALID_GEOMETRY_ID;  // triangle of the last interaction in this zone
  MacroPosition macro;      // lateral position in the macro frame (when the scene has one)
};

// The nearest hit of a single-precision Embree ray from o along d within
// [0, tfar]; hit.geomID is RTC_INVALID_GEOMETRY_ID on a miss.
inline RTCRayHit intersect(RTCScene scene, const Eigen::Vector3d& o, const Eigen::Vector3d& d, float tnear,
                           float tfar) {
  RTCRayHit rh;
  rh.ray.org_x = float(o.x());
  rh.ray.org_y = float(o.y());
  rh.ray.org_z = float(o.z());
  rh.ray.dir_x = float(d.x());
  rh.ray.dir_y = float(d.y());
  rh.ray.dir_z = float(d.z());
  rh.ray.tnear = tnear;
  rh.ray.tfar = tfar;
  rh.ray.mask = 0xFFFFFFFFu;
  rh.ray.flags = 0;
  rh.ray.time = 0.0f;
  rh.hit.geomID = RTC_INVALID_GEOMETRY_ID;
  rh.hit.instID[0] = RTC_INVALID_GEOMETRY_ID;
  RTCIntersectContext ictx;
  rtcInitIntersectContext(&ictx);
  rtcIntersect1(scene, &ictx, &rh);
  return rh;
}

// Moves the photon through one textured zone until it hits the surface or
// leaves the zone through its top or bottom plane; lateral tile walls wrap
// around (periodic tile). `path` returns the distance travelled.
//
// A photon that starts above the highest point of the surface and travels
// up, or below the lowest and travels down, cannot meet it: Embree is not
// asked (margin: half the ray offset). On a planar surface this is every ray
// leaving it after an interaction.
//
// A ray leaves a surface from just beside the hit point (s.offset, a few
// float ulps), so it can start a hair on the wrong side of the triangle it
// left, or of a neighbour at an edge, because Embree intersects in single
// precision. Hits closer than s.eps on the triangle just left, or on any
// triangle from the side the photon is not on, are such artefacts: they are
// skipped and the ray continues past them (at most kMaxSkippedHits times).
// A real hit on a neighbouring facet at a concave edge, however close, is
// kept: that is what a larger origin offset would jump over.
ZoneExit cross_zone(const TileScene& scene, const SurfaceModel& s, Photon& ph, double& path,
                    unsigned& prim) {
  constexpr int kMaxSkippedHits = 8;
  path = 0;
  const Eigen::Vector3d& d = ph.d;
  const double L = s.period;
  const bool moving_away = (d.z() > 0 && ph.p.z() > s.max_z + 0.5 * s.offset) ||
                           (d.z() < 0 && ph.p.z() < s.min_z - 0.5 * s.offset);
  const bool in_silicon = ph.medium == Medium::silicon;
  for (int k = 0; k < kMaxWallCrossings; ++k) {
    const Eigen::Vector3d& p = ph.p;
    double tz = d.z() > 0 ? (s.zone_hi - p.z()) / d.z() : d.z() < 0 ? (s.zone_lo - p.z()) / d.z() : kInf;
    double tx = d.x() > 0 ? (L - p.x()) / d.x() : d.x() < 0 ? -p.x() / d.x() : kInf;
    double ty = d.y() > 0 ? (L - p.y()) / d.y() : d.y() < 0 ? -p.y() / d.y() : kInf;
    tz = std::max(tz, 0.0);
    tx = std::max(tx, 0.0);
    ty = std::max(ty, 0.0);
    const double twall = std::min(tx, ty);
    const double tmax = std::min(tz, twall);

    if (!moving_away) {
      const float tfar = float(tmax) * (1.0f + 4e-7f) + 1e-30f;
      RTCRayHit rh = intersect(scene.get(), p, d, 0.0f, tfar);
      for (int skipped = 0; rh.hit.geomID != RTC_INVALID_GEOMETRY_ID && skipped < kMaxSkippedHits; ++skipped) {
        const double dn = d.dot(s.outward[rh.hit.primID]);
        const bool wrong_side = (dn > 0) != in_silicon || dn == 0.0;
        if (rh.ray.tfar >= s.eps || (rh.hit.primID != ph.last_prim && !wrong_side)) break;
        rh = intersect(scene.get(), p, d, std::nextafter(rh.ray.tfar, tfar), tfar);
      }

      if (rh.hit.geomID != RTC_INVALID_GEOMETRY_ID) {
        const double t = rh.ray.tfar;
        ph.p += t * d;
        path += t;
        prim = rh.hit.primID;
        ph.last_prim = prim;
        return ZoneExit::hit;
      }
    }
    ph.last_prim = RTC_INVALID_GEOMETRY_ID;  // past the wall or out of the zone: nothing left just now
    if (tz <= twall) {
      ph.p += tz * d;
      ph.p.z() = d.z() > 0 ? s.zone_hi : s.zone_lo;
      path += tz;
      return d.z() > 0 ? ZoneExit::top : ZoneExit::bottom;
    }
    // Periodic wrap at the wall(s) reached first.
    ph.p += twall * d;
    path += twall;
    if (tx <= twall) ph.p.x() = d.x() > 0 ? 0.0 : L;
    if (ty <= twall) ph.p.y() = d.y() > 0 ? 0.0 : L;
  }
  return ZoneExit::lost;
}

inline double wrap(double x, double L) {
  double r = std::fmod(x, L);
  if (r < 0) r += L;
  return r;
}

// Height of the front surface (front local z) above (x, y).
double front_height(const TraceContext& ctx, double x, double y) {
  const SurfaceModel& s = ctx.model->front;
  if (s.max_z <= s.min_z) return s.max_z;  // flat
  const RTCRayHit rh = intersect(ctx.front_scene->get(), Eigen::Vector3d(x, y, s.zone_lo), Eigen::Vector3d(0, 0, 1),
                                 0.0f, float(s.zone_hi - s.zone_lo));
  if (rh.hit.geomID == RTC_INVALID_GEOMETRY_ID) return s.max_z;  // through a crack: the top (depth >= 0)
  return s.zone_lo + rh.ray.tfar;
}

// Wafer z of a point of the photon's current zone frame.
double wafer_z(const TraceContext& ctx, Zone zone, double z_local) {
  return zone == Zone::rear ? ctx.model->rear_origin_z + z_local : ctx.model->front_origin_z + z_local;
}

// Ends the photon in instance k of state s (and in its paired group).
inline void end_in(const TraceContext& ctx, const Photon& ph, WavelengthTally& t, EndState s, int k = 0) {
  const std::size_t slot = ctx.layout->bins.slot(s, k);
  ++t.ended[slot];
  ++t.ended_by_group[std::size_t(ph.group) * ctx.layout->bins.size() + slot];
}

void tally_absorbed_si(const TraceContext& ctx, const Photon& ph, double x, double y, double z_wafer,
                       WavelengthTally& t) {
  end_in(ctx, ph, t, EndState::absorbed_silicon);
  const double surface = ctx.model->front_origin_z + front_height(ctx, wrap(x, ctx.model->front.period),
                                                                  wrap(y, ctx.model->front.period));
  const double depth = std::max(0.0, surface - z_wafer);
  const auto& edges = ctx.layout->depth_edges_um;
  auto it = std::upper_bound(edges.begin(), edges.end(), depth);
  std::size_t bin = it == edges.begin() ? 0 : std::size_t(it - edges.begin()) - 1;
  if (bin >= t.depth.size()) bin = t.depth.size() - 1;
  ++t.depth[bin];
  int pb = std::min(ph.passes, ctx.layout->pass_bins - 1);
  ++t.passes_absorbed[pb];
}

std::size_t angle_bin(const TallyLayout& L, double cos_polar, double dx, double dy) {
  double theta = std::acos(std::clamp(cos_polar, -1.0, 1.0)) * 180.0 / std::numbers::pi;
  int pb = std::clamp(int(theta / (90.0 / L.polar_bins)), 0, L.polar_bins - 1);
  double phi = std::atan2(dy, dx) * 180.0 / std::numbers::pi;
  if (phi < 0) phi += 360.0;
  int ab = std::clamp(int(phi / (360.0 / L.azimuth_bins)), 0, L.azimuth_bins - 1);
  return std::size_t(pb) * L.azimuth_bins + ab;
}

// Beer-Lambert over a straight path in the silicon: returns the fraction of
// `path` travelled before absorption, or a negative number if the photon
// survives the whole path (its optical-depth budget is reduced).
double absorb_along(Photon& ph, double alpha, double path) {
  const double od = alpha * path;
  if (od < ph.optical_depth_left) {
    ph.optical_depth_left -= od;
    return -1.0;
  }
  return ph.optical_depth_left / od;
}

Field random_linear_field(const Eigen::Vector3d& d, PhotonRng& rng) {
  Eigen::Vector3d b1, b2;
  orthonormal_basis(d, b1, b2);
  return linear_field(b1, b2, 2.0 * std::numbers::pi * rng.uniform());
}

enum class Outcome { continues, ended };

// The field after a specular event with amplitudes (a_s, a_p), normalised;
// a fresh random linear state when polarization is not carried or the
// amplitudes vanish.
//
// The new field is outgoing_field (polarization.hpp), a_s E_s s + a_p E_p p_out,
// written out with real basis vectors: a complex amplitude times a real
// component is two real products, where the generic complex-times-complex
// product would also add terms with a zero imaginary part (the results are
// the same numbers; at most the sign of a zero component can differ, which
// no later step can see).
//
// Inlined into interact and the amplitudes taken by reference: called, with
// std::complex values in two registers each and the s, p frame just written
// by decompose, the arguments were reassembled through memory (store
// forwarding stalls that measured a third of this function's time).
[[gnu::always_inline]] inline void set_field(Photon& ph, const SPComponents& sp, const cplx& as, const cplx& ap,
                                             bool carry, PhotonRng& rng) {
  if (carry) {
    const Eigen::Vector3d p_out = ph.d.cross(sp.s);
    const cplx a = as * sp.Es, b = ap * sp.Ep;
    Field E;
    for (int i = 0; i < 3; ++i)
      E[i] = cplx(a.real() * sp.s[i] + b.real() * p_out[i], a.imag() * sp.s[i] + b.imag() * p_out[i]);
    const double n2 = E.squaredNorm();
    if (n2 > 1e-300) {
      ph.E = E / std::sqrt(n2);
      return;
    }
  }
  ph.E = random_linear_field(ph.d, rng);
}

// Light in the silicon meeting a rear given by its measured reflectance R
// (io/rear_reflector.hpp): reflected with probability R, Lambertian with
// probability diffuse_fraction, else as a mirror (field as at a perfect
// conductor, r_s = -1, r_p = +1); otherwise absorbed in the reflector.
Outcome meet_rear_reflector(const TraceContext& ctx, const SurfaceOptics& so, const Eigen::Vector3d& m,
                            double cos_i, double eps, Photon& ph, PhotonRng& rng, WavelengthTally& t,
                            EndState absorbed) {
  if (rng.uniform() >= so.reflector_R) {
    end_in(ctx, ph, t, absorbed);
    return Outcome::ended;
  }
  const Eigen::Vector3d hit = ph.p;
  if (so.reflector_diffuse > 0 && rng.uniform() < so.reflector_diffuse) {
    ph.d = cosine_weighted(m, rng.uniform(), rng.uniform());
    ph.E = random_linear_field(ph.d, rng);
  } else {
    const SPComponents sp = decompose(ph.E, ph.d, m);
    ph.d = (ph.d + 2.0 * cos_i * m).normalized();
    set_field(ph, sp, cplx(-1, 0), cplx(1, 0), ctx.track_polarization, rng);
  }
  ph.p = hit + eps * m;
  return Outcome::continues;
}

// s and p power fractions of the arriving light (they add to 1): from its
// field when the polarization is carried, half and half otherwise.
inline std::pair<double, double> sp_power_fractions(const SPComponents& sp, bool carry) {
  if (!carry) return {0.5, 0.5};
  const double ws = std::norm(sp.Es), wp = std::norm(sp.Ep);
  const double wsum = ws + wp;
  return {ws / wsum, wp / wsum};
}

// One interaction with a surface triangle. `front` tells which surface.
Outcome interact(const TraceContext& ctx, bool front, unsigned prim, Photon& ph, PhotonRng& rng,
                 WavelengthTally& t) {
  const SurfaceModel& sm = front ? ctx.model->front : ctx.model->rear;
  // A patterned rear: the region under the photon's macro position decides
  // the optics and where absorbed light is counted.
  const bool opening = !front && ctx.rear_pattern && in_opening(*ctx.rear_pattern, ph.macro.x, ph.macro.y);
  const SurfaceOptics& so = front ? ctx.optics->front : opening ? ctx.optics->rear_opening : ctx.optics->rear;
  const SurfaceScatter& sc = front ? ctx.front_scatter : ctx.rear_scatter;
  const Eigen::Vector3d& nout = sm.outward[prim];
  const double dn = ph.d.dot(nout);
  const bool from_inside = dn > 0;  // travelling from the silicon to the outside
  const bool in_silicon = ph.medium == Medium::silicon;
  if (from_inside != in_silicon || dn == 0.0) {
    end_in(ctx, ph, t, EndState::lost);  // the ray met the surface from the side it is not on
    return Outcome::ended;
  }
  const Eigen::Vector3d m = from_inside ? Eigen::Vector3d(-nout) : nout;  // normal on the incident side
  if (so.reflector && !front)
    return meet_rear_reflector(ctx, so, m, std::min(1.0, std::abs(dn)), sm.offset, ph, rng, t,
                               opening ? EndState::absorbed_rear_opening_reflector : EndState::absorbed_rear_reflector);
  // Light from the silicon under a finger or busbar meets the contact:
  // silicon | metal, no films (io/front_grid.hpp).
  const bool contact = front && from_inside && ctx.grid && on_contact(*ctx.grid, ph.macro.x, ph.macro.y);
  const StackTable& table =
      contact ? ctx.optics->front_contact : (from_inside ? so.from_inside : so.from_outside)[sm.facet_class[prim]];
  const double n1 = from_inside ? so.n_inside : so.n_outside;
  const double n2 = from_inside ? so.n_outside : so.n_inside;
  const double eta = n1 / n2;

  // A diffuse (Lambertian) event: the surface first turns the arriving light
  // into Lambertian light, so the interface sees a cosine-distributed angle of
  // incidence and no particular polarization, and whatever leaves it, on
  // either side, leaves cosine-distributed. This is the surface of the
  // Lambertian light-trapping limit: from inside, an ideal interface then lets
  // out exactly 1/n² of the light whatever its direction of arrival.
  const bool diffuse = sc.kind == SurfaceScattering::lambertian ||
                       (sc.kind == SurfaceScattering::mixed && rng.uniform() <= sc.diffuse_fraction);
  const double cos_i = diffuse ? std::sqrt(rng.uniform()) : std::min(1.0, std::abs(dn));
  const double sin2t = eta * eta * (1.0 - cos_i * cos_i);
  InterfaceResponse r;
  if (so.ideal && !contact) {  // exact, no table: everything refracts unless totally reflected
    const cplx one(1, 0), zero(0, 0);
    r = sin2t >= 1.0 ? InterfaceResponse{one, one, zero, zero, 1, 1, 0, 0}
                     : InterfaceResponse{zero, zero, one, one, 0, 0, 1, 1};
  } else {
    r = table.at(cos_i);
  }

  // s and p power fractions of the arriving light: from its field when the
  // polarization is tracked, half and half for diffuse events and in the
  // averaged mode (R = (R_s + R_p)/2 at every hit).
  const SPComponents sp = decompose(ph.E, ph.d, m);
  const bool carry = ctx.track_polarization && !diffuse;
  const auto w_sp = sp_power_fractions(sp, carry);
  const double ws = w_sp.first, wp = w_sp.second;
  const double R = r.Rs * ws + r.Rp * wp;
  const double T = r.Ts * ws + r.Tp * wp;
  const double xi = rng.uniform();
  const Eigen::Vector3d hit = ph.p;

  // Mirror reflection with the field carried by r_s, r_p; stays on the incident side.
  const auto reflect_specular = [&] {
    ph.d = (ph.d + 2.0 * cos_i * m).normalized();
    set_field(ph, sp, r.rs, r.rp, carry, rng);
    ph.p = hit + sm.offset * m;
    return Outcome::continues;
  };

  if (xi <= R) {  // reflection
    if (!diffuse) return reflect_specular();
    ph.d = cosine_weighted(m, rng.uniform(), rng.uniform());
    ph.E = random_linear_field(ph.d, rng);
    ph.p = hit + sm.offset * m;
    return Outcome::continues;
  }
  if (xi <= R + T || table.layers == 0) {  // transmission (no films: nothing else can happen)
    const bool to_outside = from_inside;
    if (contact) {
      end_in(ctx, ph, t, EndState::absorbed_front_contact);
      return Outcome::ended;
    }
    if (to_outside && so.outside_absorbs) {
      // only the rear medium can absorb (a metal)
      end_in(ctx, ph, t, opening ? EndState::absorbed_rear_opening_medium : EndState::absorbed_rear_medium);
      return Outcome::ended;
    }
    if (diffuse) {
      ph.d = cosine_weighted(-m, rng.uniform(), rng.uniform());
      ph.E = random_linear_field(ph.d, rng);
    } else if (sin2t >= 1.0) {
      // T > 0 read from the table just beyond the critical angle (the
      // interpolation's edge): nothing can refract, so it reflects.
      return reflect_specular();
    } else {
      const double cos_t = std::sqrt(1.0 - sin2t);
      ph.d = (eta * ph.d + (eta * cos_i - cos_t) * m).normalized();
      set_field(ph, sp, r.ts, r.tp, carry, rng);
    }
    if (to_outside) {
      ph.medium = front ? Medium::outside_front : Medium::outside_rear;
    } else {
      ph.medium = Medium::silicon;
      ph.entered = true;
    }
    ph.p = hit - sm.offset * m;
    return Outcome::continues;
  }
  // absorbed in one of the films
  const int layer = table.pick_absorbing_layer(cos_i, ws, wp, rng.uniform());
  end_in(ctx, ph, t,
         front     ? EndState::absorbed_front_film
         : opening ? EndState::absorbed_rear_opening_film
                   : EndState::absorbed_rear_film,
         layer);
  return Outcome::ended;
}

// Direction of collimated light and the s, p frame of a launched photon:
// s and p relative to the wafer's plane of incidence (the plane through the
// direction and the wafer normal); at normal incidence the azimuth fixes the
// plane. Depends on the direction only, so for collimated light it is
// computed once per photon range (LaunchFrame) instead of once per photon.
struct LaunchFrame {
  Eigen::Vector3d d, s, p;
};

LaunchFrame launch_frame(const Illumination& il, const Eigen::Vector3d& d) {
  LaunchFrame f;
  f.d = d;
  Eigen::Vector3d s = d.cross(Eigen::Vector3d(0, 0, 1));
  if (s.squaredNorm() < 1e-20) s = Eigen::Vector3d(-std::sin(il.azimuth_rad), std::cos(il.azimuth_rad), 0);
  s.normalize();
  f.s = s;
  f.p = d.cross(s);
  return f;
}

LaunchFrame collimated_frame(const Illumination& il) {
  const double st = std::sin(il.polar_rad), ct = std::cos(il.polar_rad);
  return launch_frame(il, Eigen::Vector3d(st * std::cos(il.azimuth_rad), st * std::sin(il.azimuth_rad), -ct));
}

// Initial direction and field of a photon (`collimated`: the frame of
// collimated light; unused for diffuse light).
void launch(const TraceContext& ctx, const LaunchFrame& collimated, PhotonRng& rng, Photon& ph) {
  const Illumination& il = *ctx.illumination;
  const SurfaceModel& f = ctx.model->front;
  LaunchFrame diffuse;
  const LaunchFrame* frame = &collimated;
  if (il.kind == IlluminationKind::diffuse) {
    diffuse = launch_frame(il, cosine_weighted(Eigen::Vector3d(0, 0, -1), rng.uniform(), rng.uniform()));
    frame = &diffuse;
  }
  ph.d = frame->d;
  double psi = 0;
  switch (il.polarization) {
    case PolarizationKind::s: psi = 0; break;
    case PolarizationKind::p: psi = 0.5 * std::numbers::pi; break;
    case PolarizationKind::unpolarized: psi = std::numbers::pi * rng.uniform(); break;
  }
  ph.E = linear_field(frame->s, frame->p, psi);
  ph.p = Eigen::Vector3d(f.period * rng.uniform(), f.period * rng.uniform(), f.zone_hi);
  ph.zone = Zone::front;
  ph.medium = Medium::outside_front;
  ph.optical_depth_left = -std::log(rng.uniform());
}

// Light from the ambient on its way to the cell plane, meeting the front grid
// (io/front_grid.hpp, trace/front_grid_hit.hpp). On entry ph.macro is the
// point of the cell plane the light would reach without a grid and ph.d its
// direction. The metal reflects (ambient | metal Fresnel at the local angle,
// or Lambertian by the grid's scattering) or absorbs; light reflected
// downwards past the bodies lands on the cell beside them and goes on from
// there (ph.macro, ph.d, ph.E updated); light leaving upwards is reflected
// by the grid. Reflected light that meets another body is traced to it too.
Outcome meet_grid_from_ambient(const TraceContext& ctx, Photon& ph, PhotonRng& rng, WavelengthTally& t) {
  const FrontGridGeometry& g = *ctx.grid;
  const double top = grid_top(g);
  Eigen::Vector3d o = Eigen::Vector3d(ph.macro.x, ph.macro.y, 0) - ph.d * ((top + 1.0) / -ph.d.z());
  constexpr int kMaxGridBounces = 100;
  for (int bounce = 0; bounce < kMaxGridBounces; ++bounce) {
    const GridHit h = first_grid_hit(g, o, ph.d);
    if (!h.hit) {
      if (ph.d.z() >= 0) {
        end_in(ctx, ph, t, EndState::reflected_grid);
        return Outcome::ended;
      }
      const Eigen::Vector3d land = o + (-o.z() / ph.d.z()) * ph.d;
      MacroPosition m;
      move_macro(ctx.macro, m, land.x(), land.y());
      ph.macro = m;
      return Outcome::continues;
    }
    const Eigen::Vector3d& m = h.normal;  // outward: on the incident side
    const bool diffuse = ctx.grid_scatter.kind == SurfaceScattering::lambertian ||
                         (ctx.grid_scatter.kind == SurfaceScattering::mixed &&
                          rng.uniform() <= ctx.grid_scatter.diffuse_fraction);
    const double cos_i = diffuse ? std::sqrt(rng.uniform()) : std::clamp(-ph.d.dot(m), 0.0, 1.0);
    const InterfaceResponse r = ctx.optics->grid_from_ambient.at(cos_i);
    const SPComponents sp = decompose(ph.E, ph.d, m);
    const bool carry = ctx.track_polarization && !diffuse;
    const auto w_sp = sp_power_fractions(sp, carry);
    const double ws = w_sp.first, wp = w_sp.second;
    if (rng.uniform() > r.Rs * ws + r.Rp * wp) {
      end_in(ctx, ph, t, EndState::absorbed_grid);
      return Outcome::ended;
    }
    if (diffuse) {
      ph.d = cosine_weighted(m, rng.uniform(), rng.uniform());
      ph.E = random_linear_field(ph.d, rng);
    } else {
      ph.d = (ph.d + 2.0 * cos_i * m).normalized();
      set_field(ph, sp, r.rs, r.rp, carry, rng);
    }
    o = h.point + 1e-6 * m;
  }
  end_in(ctx, ph, t, EndState::unresolved);
  return Outcome::ended;
}

void trace_one(const TraceContext& ctx, const LaunchFrame& collimated, PhotonRng& rng, std::uint32_t group,
               const MacroPosition& start, WavelengthTally& t) {
  Photon ph;
  ph.group = group;
  ph.macro = start;
  launch(ctx, collimated, rng, ph);
  if (ctx.grid && meet_grid_from_ambient(ctx, ph, rng, t) == Outcome::ended) return;
  const bool macro = ctx.macro.active();
  const WaferModel& M = *ctx.model;
  const double alpha = ctx.optics->alpha_per_um;
  const TallyLayout& L = *ctx.layout;

  for (;;) {
    if (ph.zone == Zone::bulk_down || ph.zone == Zone::bulk_up) {
      // Straight crossing of the flat bulk between the textured zones.
      const double path = M.bulk_gap / std::abs(ph.d.z());
      const bool down = ph.zone == Zone::bulk_down;
      const double start_z = down ? M.front_origin_z + M.front.zone_lo : M.rear_origin_z + M.rear.zone_hi;
      const double f = absorb_along(ph, alpha, path);
      if (f >= 0) {
        const Eigen::Vector3d q = ph.p + f * path * ph.d;
        tally_absorbed_si(ctx, ph, q.x(), q.y(), start_z + f * path * ph.d.z(), t);
        return;
      }
      ++ph.passes;
      ++t.bulk_passes;
      if (macro) move_macro(ctx.macro, ph.macro, path * ph.d.x(), path * ph.d.y());
      const SurfaceModel& next = down ? M.rear : M.front;
      if (ctx.randomize_lateral) {
        ph.p.x() = next.period * rng.uniform();
        ph.p.y() = next.period * rng.uniform();
      } else {
        ph.p.x() = wrap(ph.p.x() + path * ph.d.x(), next.period);
        ph.p.y() = wrap(ph.p.y() + path * ph.d.y(), next.period);
      }
      if (down) {
        ph.p.z() = M.rear.zone_hi;
        ph.zone = Zone::rear;
        ++t.rear_angle[angle_bin(L, -ph.d.z(), ph.d.x(), ph.d.y())];
      } else {
        ph.p.z() = M.front.zone_lo;
        ph.zone = Zone::front;
      }
      continue;
    }

    if (ph.interactions >= ctx.max_bounces) {
      end_in(ctx, ph, t, EndState::unresolved);
      return;
    }
    const bool front = ph.zone == Zone::front;
    const SurfaceModel& sm = front ? M.front : M.rear;
    double path = 0;
    unsigned prim = 0;
    const Eigen::Vector3d start = ph.p;
    const ZoneExit ex = cross_zone(front ? *ctx.front_scene : *ctx.rear_scene, sm, ph, path, prim);
    if (macro) move_macro(ctx.macro, ph.macro, path * ph.d.x(), path * ph.d.y());
    if (ph.medium == Medium::silicon) {
      const double f = absorb_along(ph, alpha, path);
      if (f >= 0) {
        // The absorption point, unwrapped from the segment's start: depth
        // needs only its height and its (wrapped) lateral position.
        const double dist = f * path;
        const Eigen::Vector3d q = start + dist * ph.d;
        tally_absorbed_si(ctx, ph, q.x(), q.y(), wafer_z(ctx, ph.zone, q.z()), t);
        return;
      }
    }
    switch (ex) {
      case ZoneExit::hit:
        ++ph.interactions;
        ++t.interactions;
        if (interact(ctx, front, prim, ph, rng, t) == Outcome::ended) return;
        break;
      case ZoneExit::top:
        if (front && ph.medium == Medium::outside_front) {
          if (ph.entered) {
            end_in(ctx, ph, t, EndState::escaped_front);
            ++t.escape_angle[angle_bin(L, ph.d.z(), ph.d.x(), ph.d.y())];
          } else {
            end_in(ctx, ph, t, EndState::reflected_front);
            ++t.front_hits[std::min(ph.interactions, L.hit_bins - 1)];
          }
          return;
        }
        if (!front && ph.medium == Medium::silicon) {
          ph.zone = Zone::bulk_up;
          break;
        }
        end_in(ctx, ph, t, EndState::lost);
        return;
      case ZoneExit::bottom:
        if (front && ph.medium == Medium::silicon) {
          ph.zone = Zone::bulk_down;
          break;
        }
        if (!front && ph.medium == Medium::outside_rear) {
          end_in(ctx, ph, t, EndState::transmitted_rear);
          return;
        }
        end_in(ctx, ph, t, EndState::lost);
        return;
      case ZoneExit::lost:
        end_in(ctx, ph, t, EndState::lost);
        return;
    }
  }
}

}  // namespace

TraceContext make_trace_context(const Scene& scene, const WaferModel& model, const TileScene& front,
                                const TileScene& rear, const WavelengthOptics& optics,
                                const TallyLayout& layout, std::uint64_t wavelength_index) {
  TraceContext c;
  c.model = &model;
  c.front_scene = &front;
  c.rear_scene = &rear;
  c.optics = &optics;
  c.layout = &layout;
  c.illumination = &scene.illumination;
  c.front_scatter = {scene.front.scattering, scene.front.diffuse_fraction};
  c.rear_scatter = {scene.rear.scattering, scene.rear.diffuse_fraction};
  c.max_bounces = scene.run.max_bounces;
  c.randomize_lateral = scene.run.randomize_lateral;
  c.track_polarization = scene.run.track_polarization;
  c.seed = scene.run.seed;
  c.wavelength_index = wavelength_index;
  c.macro = scene_macro_frame(scene);
  c.rear_pattern = scene.rear_pattern ? &scene.rear_pattern->geometry : nullptr;
  if (scene.front_grid) {
    c.grid = &scene.front_grid->geometry;
    c.grid_scatter = {scene.front_grid->scattering, scene.front_grid->diffuse_fraction};
  }
  return c;
}


void trace_photons(const TraceContext& ctx, std::uint64_t begin, std::uint64_t end, WavelengthTally& tally) {
  const LaunchFrame collimated = collimated_frame(*ctx.illumination);
  for (std::uint64_t i = begin; i < end; ++i) {
    PhotonRng rng(ctx.seed, ctx.variant, ctx.wavelength_index, i);
    const auto group = std::uint32_t(i % std::uint64_t(ctx.layout->photon_groups));
    ++tally.photons;
    MacroPosition start;
    if (ctx.macro.active()) {  // from a stream of its own: the transport's numbers stay those of a plain scene
      PhotonRng side(ctx.seed, ctx.variant, ctx.wavelength_index, i, 1);
      start = macro_start(ctx.macro, side.uniform(), side.uniform());
    }
    trace_one(ctx, collimated, rng, group, start, tally);
  }
}

}  // namespace lumtrap
