// Cutting convex polygons by half-planes.
#include <gtest/gtest.h>

#include "geometry/convex_polygon.hpp"

namespace lumtrap::geometry {
namespace {

ConvexPolygon square(double s) {
  ConvexPolygon p;
  for (Point2 q : {Point2{0, 0}, Point2{s, 0}, Point2{s, s}, Point2{0, s}}) p.push(q, 0.0);
  return p;
}

TEST(ConvexPolygon, AreaPerimeterThickness) {
  const ConvexPolygon p = square(2.0);
  EXPECT_DOUBLE_EQ(signed_area(p), 4.0);
  EXPECT_DOUBLE_EQ(perimeter(p), 8.0);
  EXPECT_DOUBLE_EQ(thickness(p), 1.0);
  ConvexPolygon strip;
  for (Point2 q : {Point2{0, 0}, Point2{10, 0}, Point2{10, 1e-6}, Point2{0, 1e-6}}) strip.push(q, 0.0);
  EXPECT_NEAR(thickness(strip), 1e-6, 1e-12);  // a long strip: its width
}

TEST(ConvexPolygon, SplitByADiagonalKeepsTheAreaAndSharesTheCut) {
  // x + 0.5·y - 1 > 0 cuts the 2 x 2 square
  const HalfPlane h{1.0, 0.5, -1.0};
  ConvexPolygon in, out;
  split(square(2.0), h, 1e-12, in, out);
  EXPECT_NEAR(signed_area(in) + signed_area(out), 4.0, 1e-14);
  EXPECT_GT(signed_area(in), 0);
  EXPECT_GT(signed_area(out), 0);
  for (int i = 0; i < in.n; ++i) EXPECT_GE(h.value(in.v[i]), -1e-12);
  for (int i = 0; i < out.n; ++i) EXPECT_LE(h.value(out.v[i]), 1e-12);
  // the two cut points appear bit for bit in both pieces
  int shared = 0;
  for (int i = 0; i < in.n; ++i)
    for (int j = 0; j < out.n; ++j) shared += in.v[i].x == out.v[j].x && in.v[i].y == out.v[j].y;
  EXPECT_EQ(shared, 2);
}

TEST(ConvexPolygon, CutThroughAVertexAndAlongAnEdge) {
  // line x = y through two corners: two triangles of area 2
  ConvexPolygon in, out;
  split(square(2.0), {1.0, -1.0, 0.0}, 1e-12, in, out);
  EXPECT_EQ(in.n, 3);
  EXPECT_EQ(out.n, 3);
  EXPECT_DOUBLE_EQ(signed_area(in), 2.0);
  EXPECT_DOUBLE_EQ(signed_area(out), 2.0);
  // line x = 0 along an edge: all inside, nothing outside
  split(square(2.0), {1.0, 0.0, 0.0}, 1e-12, in, out);
  EXPECT_DOUBLE_EQ(signed_area(in), 4.0);
  EXPECT_TRUE(out.empty());
  // a cut closer than eps to a corner does not make a sliver
  split(square(2.0), {1.0, 0.0, -(2.0 - 1e-14)}, 1e-12, in, out);
  EXPECT_TRUE(in.empty());
  EXPECT_DOUBLE_EQ(signed_area(out), 4.0);
}

TEST(ConvexPolygon, ClipKeepsTheInside) {
  const ConvexPolygon c = clip(square(1.0), {-1.0, -1.0, 1.0}, 1e-12);  // x + y < 1
  EXPECT_EQ(c.n, 3);
  EXPECT_DOUBLE_EQ(signed_area(c), 0.5);
}

}  // namespace
}  // namespace lumtrap::geometry
