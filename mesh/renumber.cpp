// Node renumbering: reverse Cuthill-McKee over the element graph.
#include "mesh/renumber.hpp"

#include <algorithm>
#include <cstdlib>
#include <numeric>
#include <stdexcept>

namespace hearth {
namespace {

// Node adjacency in compressed rows: the neighbours of node i are
// neighbours[offsets[i] .. offsets[i+1]).
struct NodeGraph {
  std::vector<std::size_t> offsets;
  std::vector<std::int32_t> neighbours;
  std::size_t degree(std::int32_t i) const { return offsets[i + 1] - offsets[i]; }
};

NodeGraph build_node_graph(const Mesh& mesh) {
  const std::size_t n_nodes = mesh.n_nodes();
  const std::size_t per_tet = static_cast<std::size_t>(mesh.nodes_per_tet());
  // Elements around each node (compressed rows).
  std::vector<std::size_t> tet_offsets(n_nodes + 1, 0);
  for (std::int32_t v : mesh.tet_nodes) ++tet_offsets[static_cast<std::size_t>(v) + 1];
  std::partial_sum(tet_offsets.begin(), tet_offsets.end(), tet_offsets.begin());
  std::vector<std::int32_t> node_tets(mesh.tet_nodes.size());
  {
    std::vector<std::size_t> fill(tet_offsets.begin(), tet_offsets.end() - 1);
    for (std::size_t k = 0; k < mesh.tet_nodes.size(); ++k)
      node_tets[fill[static_cast<std::size_t>(mesh.tet_nodes[k])]++] = static_cast<std::int32_t>(k / per_tet);
  }
  // Neighbours: the distinct other nodes of those elements, found with a marker; two
  // parallel passes over the nodes (count, then fill), each thread with its own marker.
  NodeGraph graph;
  graph.offsets.assign(n_nodes + 1, 0);
  const std::int64_t n_nodes64 = static_cast<std::int64_t>(n_nodes);
  auto for_each_neighbour = [&](std::int64_t i, std::vector<std::int64_t>& marker, auto&& visit) {
    marker[i] = i;
    for (std::size_t k = tet_offsets[i]; k < tet_offsets[i + 1]; ++k) {
      const std::int32_t* t = mesh.tet(static_cast<std::size_t>(node_tets[k]));
      for (std::size_t a = 0; a < per_tet; ++a) {
        const std::int32_t j = t[a];
        if (marker[j] == i) continue;
        marker[j] = i;
        visit(j);
      }
    }
  };
#pragma omp parallel
  {
    std::vector<std::int64_t> marker(n_nodes, -1);
#pragma omp for schedule(dynamic, 4096)
    for (std::int64_t i = 0; i < n_nodes64; ++i) {
      std::size_t count = 0;
      for_each_neighbour(i, marker, [&](std::int32_t) { ++count; });
      graph.offsets[i + 1] = count;
    }
  }
  std::partial_sum(graph.offsets.begin(), graph.offsets.end(), graph.offsets.begin());
  graph.neighbours.resize(graph.offsets[n_nodes]);
#pragma omp parallel
  {
    std::vector<std::int64_t> marker(n_nodes, -1);
#pragma omp for schedule(dynamic, 4096)
    for (std::int64_t i = 0; i < n_nodes64; ++i) {
      std::size_t fill = graph.offsets[i];
      for_each_neighbour(i, marker, [&](std::int32_t j) { graph.neighbours[fill++] = j; });
    }
  }
  return graph;
}

// Breadth-first level structure from `root` over unnumbered nodes of one component.
// Fills `level` (stamped per call through `stamp`) and returns the nodes of the last
// level and the number of levels.
struct LastLevel {
  std::vector<std::int32_t> nodes;
  int depth = 0;
};

LastLevel last_level_from(const NodeGraph& graph, std::int32_t root, std::vector<int>& visit_stamp, int stamp,
                          std::vector<std::int32_t>& queue) {
  queue.clear();
  queue.push_back(root);
  visit_stamp[root] = stamp;
  std::size_t level_begin = 0;
  int depth = 0;
  while (true) {
    const std::size_t level_end = queue.size();
    for (std::size_t q = level_begin; q < level_end; ++q) {
      const std::int32_t i = queue[q];
      for (std::size_t k = graph.offsets[i]; k < graph.offsets[i + 1]; ++k) {
        const std::int32_t j = graph.neighbours[k];
        if (visit_stamp[j] == stamp) continue;
        visit_stamp[j] = stamp;
        queue.push_back(j);
      }
    }
    ++depth;
    if (queue.size() == level_end) return {std::vector<std::int32_t>(queue.begin() + level_begin, queue.end()), depth};
    level_begin = level_end;
  }
}

// George and Liu: move to a smallest-degree node of the last level while the level
// structure gets deeper.
std::int32_t pseudo_peripheral_node(const NodeGraph& graph, std::int32_t start, std::vector<int>& visit_stamp,
                                    int& stamp, std::vector<std::int32_t>& queue) {
  std::int32_t root = start;
  LastLevel last = last_level_from(graph, root, visit_stamp, ++stamp, queue);
  for (int iteration = 0; iteration < 8; ++iteration) {
    const std::int32_t candidate = *std::min_element(
        last.nodes.begin(), last.nodes.end(),
        [&](std::int32_t a, std::int32_t b) { return graph.degree(a) < graph.degree(b); });
    LastLevel next = last_level_from(graph, candidate, visit_stamp, ++stamp, queue);
    if (next.depth <= last.depth) break;
    root = candidate;
    last = std::move(next);
  }
  return root;
}

}  // namespace

std::vector<std::int32_t> reverse_cuthill_mckee_order(const Mesh& mesh) {
  const std::size_t n_nodes = mesh.n_nodes();
  const NodeGraph graph = build_node_graph(mesh);
  std::vector<std::int32_t> order;  // old numbers in Cuthill-McKee order
  order.reserve(n_nodes);
  std::vector<char> numbered(n_nodes, 0);
  std::vector<int> visit_stamp(n_nodes, 0);
  int stamp = 0;
  std::vector<std::int32_t> queue, by_degree;
  // Components are started in order of smallest-degree remaining node (a counting
  // sort on the degree, stable as the numbering it starts from).
  std::size_t max_degree = 0;
  for (std::size_t i = 0; i < n_nodes; ++i) max_degree = std::max(max_degree, graph.degree(static_cast<std::int32_t>(i)));
  std::vector<std::size_t> degree_start(max_degree + 2, 0);
  for (std::size_t i = 0; i < n_nodes; ++i) ++degree_start[graph.degree(static_cast<std::int32_t>(i)) + 1];
  std::partial_sum(degree_start.begin(), degree_start.end(), degree_start.begin());
  std::vector<std::int32_t> candidates(n_nodes);
  for (std::size_t i = 0; i < n_nodes; ++i)
    candidates[degree_start[graph.degree(static_cast<std::int32_t>(i))]++] = static_cast<std::int32_t>(i);
  for (const std::int32_t seed : candidates) {
    if (numbered[seed]) continue;
    const std::int32_t root = pseudo_peripheral_node(graph, seed, visit_stamp, stamp, queue);
    std::size_t head = order.size();
    order.push_back(root);
    numbered[root] = 1;
    while (head < order.size()) {
      const std::int32_t i = order[head++];
      by_degree.clear();
      for (std::size_t k = graph.offsets[i]; k < graph.offsets[i + 1]; ++k) {
        const std::int32_t j = graph.neighbours[k];
        if (!numbered[j]) {
          numbered[j] = 1;
          by_degree.push_back(j);
        }
      }
      std::sort(by_degree.begin(), by_degree.end(), [&](std::int32_t a, std::int32_t b) {
        return graph.degree(a) != graph.degree(b) ? graph.degree(a) < graph.degree(b) : a < b;
      });
      order.insert(order.end(), by_degree.begin(), by_degree.end());
    }
  }
  std::vector<std::int32_t> new_number(n_nodes);
  for (std::size_t k = 0; k < n_nodes; ++k) new_number[order[k]] = static_cast<std::int32_t>(n_nodes - 1 - k);
  return new_number;
}

void apply_node_numbering(Mesh& mesh, const std::vector<std::int32_t>& new_number) {
  const std::size_t n_nodes = mesh.n_nodes();
  if (new_number.size() != n_nodes) throw std::invalid_argument("apply_node_numbering: size differs from n_nodes");
  std::vector<double> coords(mesh.coords.size());
  const std::int64_t n_nodes64 = static_cast<std::int64_t>(n_nodes);
#pragma omp parallel for schedule(static)
  for (std::int64_t i = 0; i < n_nodes64; ++i)
    for (int d = 0; d < 3; ++d) coords[3 * static_cast<std::size_t>(new_number[i]) + d] = mesh.coords[3 * i + d];
  mesh.coords = std::move(coords);
  const std::int64_t n_tet_nodes = static_cast<std::int64_t>(mesh.tet_nodes.size());
#pragma omp parallel for schedule(static)
  for (std::int64_t k = 0; k < n_tet_nodes; ++k) mesh.tet_nodes[k] = new_number[mesh.tet_nodes[k]];
  for (std::int32_t& v : mesh.face_nodes) v = new_number[v];
}

void sort_elements_by_lowest_node(Mesh& mesh) {
  // A counting sort on the lowest node: stable, and linear in the elements.
  const int per_tet = mesh.nodes_per_tet();
  const std::int64_t n_tets = static_cast<std::int64_t>(mesh.n_tets());
  std::vector<std::int32_t> lowest(mesh.n_tets());
#pragma omp parallel for schedule(static)
  for (std::int64_t e = 0; e < n_tets; ++e) lowest[e] = *std::min_element(mesh.tet(e), mesh.tet(e) + per_tet);
  std::vector<std::int64_t> start(mesh.n_nodes() + 1, 0);
  for (const std::int32_t v : lowest) ++start[static_cast<std::size_t>(v) + 1];
  std::partial_sum(start.begin(), start.end(), start.begin());
  std::vector<std::int32_t> order(mesh.n_tets());
  for (std::int64_t e = 0; e < n_tets; ++e) order[start[lowest[e]]++] = static_cast<std::int32_t>(e);
  std::vector<std::int32_t> nodes(mesh.tet_nodes.size()), region(mesh.n_tets());
  std::vector<double> quality(mesh.tet_quality.size());
#pragma omp parallel for schedule(static)
  for (std::int64_t k = 0; k < n_tets; ++k) {
    const std::size_t e = static_cast<std::size_t>(order[k]);
    std::copy(mesh.tet(e), mesh.tet(e) + per_tet, nodes.begin() + k * per_tet);
    region[k] = mesh.tet_region[e];
    if (!quality.empty()) quality[k] = mesh.tet_quality[e];
  }
  mesh.tet_nodes = std::move(nodes);
  mesh.tet_region = std::move(region);
  mesh.tet_quality = std::move(quality);
}

void renumber_reverse_cuthill_mckee(Mesh& mesh) {
  apply_node_numbering(mesh, reverse_cuthill_mckee_order(mesh));
  sort_elements_by_lowest_node(mesh);
}

std::size_t node_bandwidth(const Mesh& mesh) {
  std::size_t bandwidth = 0;
  const int per_tet = mesh.nodes_per_tet();
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* t = mesh.tet(e);
    const auto [lo, hi] = std::minmax_element(t, t + per_tet);
    bandwidth = std::max(bandwidth, static_cast<std::size_t>(*hi - *lo));
  }
  return bandwidth;
}

}  // namespace hearth
