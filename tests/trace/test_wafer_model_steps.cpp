// build_wafer_model in two steps (build_wafer_geometry, then
// add_facet_normals, the order prepare_run uses so that the Embree scenes are
// built before the per-triangle normals exist) gives exactly the model of the
// one-step call.
#include "trace/wafer_model.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

const char* kScene = R"(
[wafer]
thickness = "150 um"
thickness_convention = "base"
[front]
texture = "random_pyramids"
conformality = "directional"
[front.random_pyramids]
min = "1 um"
max = "4 um"
tile = "20 um"
flat_fraction = 0.2
[rear]
texture = "inverted_pyramids"
[rear.pyramids]
base = "6 um"
[illumination]
wavelengths = ["800 nm"]
)";

void expect_same_surface(const SurfaceModel& a, const SurfaceModel& b) {
  EXPECT_EQ(a.mesh.vertices, b.mesh.vertices);
  EXPECT_EQ(a.mesh.triangles, b.mesh.triangles);
  EXPECT_EQ(a.outward, b.outward);
  EXPECT_EQ(a.facet_class, b.facet_class);
  EXPECT_EQ(a.tilt_cos, b.tilt_cos);
  EXPECT_EQ(a.min_z, b.min_z);
  EXPECT_EQ(a.max_z, b.max_z);
  EXPECT_EQ(a.zone_lo, b.zone_lo);
  EXPECT_EQ(a.zone_hi, b.zone_hi);
  EXPECT_EQ(a.period, b.period);
  EXPECT_EQ(a.eps, b.eps);
}

TEST(WaferModelSteps, TwoStepsEqualOneStep) {
  const Scene scene = test::scene_from_text(kScene);
  const WaferModel one = build_wafer_model(scene);
  WaferModel two = build_wafer_geometry(scene);
  EXPECT_TRUE(two.front.outward.empty());  // no per-triangle data before the second step
  EXPECT_TRUE(two.rear.facet_class.empty());
  add_facet_normals(two, scene);
  expect_same_surface(one.front, two.front);
  expect_same_surface(one.rear, two.rear);
  EXPECT_EQ(one.front_origin_z, two.front_origin_z);
  EXPECT_EQ(one.rear_origin_z, two.rear_origin_z);
  EXPECT_EQ(one.bulk_gap, two.bulk_gap);
  EXPECT_EQ(one.front_surface_min_z, two.front_surface_min_z);
  // directional films: one facet class per distinct tilt (flat regions, pyramid facets)
  EXPECT_EQ(two.front.tilt_cos.size(), 2u);
}

TEST(WaferModelSteps, PreparedRunHasNormals) {
  auto run = prepare_run(test::scene_from_text(kScene));
  EXPECT_EQ(run->model.front.outward.size(), run->model.front.mesh.triangles.size());
  EXPECT_EQ(run->model.rear.outward.size(), run->model.rear.mesh.triangles.size());
  EXPECT_EQ(run->model.front.facet_class.size(), run->model.front.mesh.triangles.size());
}

}  // namespace
}  // namespace lumtrap
