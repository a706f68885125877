// Raw arrays with their counts; the layout is spelled out in the header.
#include "tools/driver/mesh_file.hpp"

#include <cerrno>
#include <cstdint>
#include <fstream>
#include <stdexcept>
#include <vector>

#include "io/atomic_file.hpp"
#include "io/write_error.hpp"

namespace hearth {

namespace fs = std::filesystem;

namespace {

// Counts as uint64, then the raw values; strings as length + bytes.
template <class T>
void put_vector(std::ofstream& out, const std::vector<T>& v) {
  const std::uint64_t n = v.size();
  out.write(reinterpret_cast<const char*>(&n), sizeof n);
  out.write(reinterpret_cast<const char*>(v.data()), static_cast<std::streamsize>(n * sizeof(T)));
}
template <class T>
void get_vector(std::ifstream& in, std::vector<T>& v) {
  std::uint64_t n = 0;
  in.read(reinterpret_cast<char*>(&n), sizeof n);
  v.resize(n);
  in.read(reinterpret_cast<char*>(v.data()), static_cast<std::streamsize>(n * sizeof(T)));
}
void put_entities(std::ofstream& out, const std::vector<NamedEntity>& entities) {
  const std::uint64_t n = entities.size();
  out.write(reinterpret_cast<const char*>(&n), sizeof n);
  for (const auto& e : entities) {
    put_vector(out, std::vector<char>(e.name.begin(), e.name.end()));
    out.write(reinterpret_cast<const char*>(&e.tag), sizeof e.tag);
  }
}
void get_entities(std::ifstream& in, std::vector<NamedEntity>& entities) {
  std::uint64_t n = 0;
  in.read(reinterpret_cast<char*>(&n), sizeof n);
  entities.resize(n);
  for (auto& e : entities) {
    std::vector<char> name;
    get_vector(in, name);
    e.name.assign(name.begin(), name.end());
    in.read(reinterpret_cast<char*>(&e.tag), sizeof e.tag);
  }
}

}  // namespace

void write_mesh_file(const fs::path& path, const Mesh& m) {
  std::ofstream out(path, std::ios::binary);
  out.write(reinterpret_cast<const char*>(&m.order), sizeof m.order);
  put_vector(out, m.coords);
  put_vector(out, m.tet_nodes);
  put_vector(out, m.tet_region);
  put_vector(out, m.face_nodes);
  put_vector(out, m.face_boundary);
  put_vector(out, m.tet_quality);
  put_entities(out, m.regions);
  put_entities(out, m.boundaries);
  const std::uint64_t unnamed = m.unnamed_exterior_faces;
  out.write(reinterpret_cast<const char*>(&unnamed), sizeof unnamed);
  out.close();
  if (!out) throw WriteError(write_failure(path, errno) + " (a mesh file)");
}

Mesh read_mesh_file(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  Mesh m;
  in.read(reinterpret_cast<char*>(&m.order), sizeof m.order);
  get_vector(in, m.coords);
  get_vector(in, m.tet_nodes);
  get_vector(in, m.tet_region);
  get_vector(in, m.face_nodes);
  get_vector(in, m.face_boundary);
  get_vector(in, m.tet_quality);
  get_entities(in, m.regions);
  get_entities(in, m.boundaries);
  std::uint64_t unnamed = 0;
  in.read(reinterpret_cast<char*>(&unnamed), sizeof unnamed);
  m.unnamed_exterior_faces = unnamed;
  if (!in) throw std::runtime_error("cannot read the mesh file " + path.string() + " whole");
  return m;
}

}  // namespace hearth
