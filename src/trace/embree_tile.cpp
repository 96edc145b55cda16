#include "trace/embree_tile.hpp"

#include <cstdint>
#include <stdexcept>
#include <string>

namespace lumtrap {

namespace {

// Embree reports errors through this callback (and rtcGetDeviceError): the
// message is kept on the device's holder and thrown after the call that
// failed, so the user sees Embree's own words.
void embree_error(void* user, RTCError code, const char* message) {
  auto* last = static_cast<std::string*>(user);
  *last = "Embree error " + std::to_string(int(code)) + (message ? std::string(": ") + message : std::string());
}

}  // namespace

EmbreeDevice::EmbreeDevice() {
  device_ = rtcNewDevice("verbose=0");
  if (!device_) throw std::runtime_error("cannot create an Embree device (Embree " RTC_VERSION_STRING ")");
  rtcSetDeviceErrorFunction(device_, embree_error, &last_error_);
}

EmbreeDevice::~EmbreeDevice() { rtcReleaseDevice(device_); }

void EmbreeDevice::throw_if_error(const char* what) const {
  const RTCError err = rtcGetDeviceError(device_);
  if (err == RTC_ERROR_NONE) return;
  std::string message = last_error_.empty() ? "Embree error " + std::to_string(int(err)) : last_error_;
  last_error_.clear();
  throw std::runtime_error(message + " (" + what + ")");
}

TileScene::TileScene(const EmbreeDevice& device, const geometry::TileMesh& mesh) {
  RTCDevice dev = device.get();
  scene_ = rtcNewScene(dev);
  if (!scene_) device.throw_if_error("new scene");
  // From here on the destructor does not run if this constructor throws:
  // release the scene on every way out but the last.
  struct Guard {
    RTCScene& scene;
    bool armed = true;
    ~Guard() {
      if (armed && scene) rtcReleaseScene(scene);
    }
  } guard{scene_};
  rtcSetSceneFlags(scene_, RTC_SCENE_FLAG_ROBUST);
  rtcSetSceneBuildQuality(scene_, RTC_BUILD_QUALITY_HIGH);

  RTCGeometry geom = rtcNewGeometry(dev, RTC_GEOMETRY_TYPE_TRIANGLE);
  if (!geom) device.throw_if_error("new triangle geometry");
  struct GeometryRef {
    RTCGeometry g;
    ~GeometryRef() { rtcReleaseGeometry(g); }  // the scene keeps its own reference once attached
  } geom_ref{geom};
  auto* v = static_cast<float*>(rtcSetNewGeometryBuffer(geom, RTC_BUFFER_TYPE_VERTEX, 0, RTC_FORMAT_FLOAT3,
                                                        3 * sizeof(float), mesh.vertices.size()));
  if (!v) {
    device.throw_if_error("vertex buffer allocation");
    throw std::runtime_error("Embree vertex buffer allocation failed");
  }
  for (std::size_t i = 0; i < mesh.vertices.size(); ++i)
    for (int c = 0; c < 3; ++c) v[3 * i + c] = float(mesh.vertices[i][c]);
  // The index buffer is the mesh's own triangle array (three packed uint32
  // per triangle, Embree's RTC_FORMAT_UINT3), not a copy: on a 1 mm tile of
  // random pyramids (~10^7 triangles) that saves ~130 MB.
  static_assert(sizeof(mesh.triangles[0]) == 3 * sizeof(std::uint32_t), "triangles must be packed uint32 triples");
  rtcSetSharedGeometryBuffer(geom, RTC_BUFFER_TYPE_INDEX, 0, RTC_FORMAT_UINT3, mesh.triangles.data(), 0,
                             3 * sizeof(std::uint32_t), mesh.triangles.size());
  device.throw_if_error("index buffer");
  rtcCommitGeometry(geom);
  rtcAttachGeometry(scene_, geom);
  rtcCommitScene(scene_);
  device.throw_if_error("scene build");
  guard.armed = false;
}

TileScene::~TileScene() { rtcReleaseScene(scene_); }

}  // namespace lumtrap
