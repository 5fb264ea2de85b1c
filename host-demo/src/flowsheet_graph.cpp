#include "flowsheet_graph.hpp"

#include <algorithm>
#include <functional>
#include <map>
#include <optional>

namespace protonflow::host {
namespace {

// Enough cycles to rank streams on any flowsheet a person draws; the greedy choice stays correct
// beyond it (it tears until no cycle is left), it only ranks on a sample.
constexpr std::size_t cycle_sample_limit = 4096;

struct Graph {
  std::size_t vertices;
  std::vector<const GraphEdge*> edges;  // the active ones

  std::vector<std::vector<const GraphEdge*>> outgoing() const {
    std::vector<std::vector<const GraphEdge*>> out(vertices);
    for (const GraphEdge* edge : edges) out[edge->from].push_back(edge);
    return out;
  }
};

// Simple cycles as lists of edges, each found once from its lowest vertex (the classic bounded
// enumeration: from start s, walk only through vertices above s).
std::vector<std::vector<const GraphEdge*>> find_cycles(const Graph& graph, std::size_t limit) {
  const auto out = graph.outgoing();
  std::vector<std::vector<const GraphEdge*>> cycles;
  std::vector<const GraphEdge*> path;
  std::vector<bool> on_path(graph.vertices, false);
  for (std::size_t start = 0; start < graph.vertices && cycles.size() < limit; ++start) {
    const std::function<void(std::size_t)> walk = [&](std::size_t vertex) {
      for (const GraphEdge* edge : out[vertex]) {
        if (cycles.size() >= limit) return;
        if (edge->to == start) {
          path.push_back(edge);
          cycles.push_back(path);
          path.pop_back();
        } else if (edge->to > start && !on_path[edge->to]) {
          on_path[edge->to] = true;
          path.push_back(edge);
          walk(edge->to);
          path.pop_back();
          on_path[edge->to] = false;
        }
      }
    };
    on_path[start] = true;
    walk(start);
    on_path[start] = false;
  }
  return cycles;
}

bool on_some_cycle(const Graph& graph, const GraphEdge& edge) {
  // edge from → to lies on a cycle iff to reaches from.
  const auto out = graph.outgoing();
  std::vector<bool> seen(graph.vertices, false);
  std::vector<std::size_t> stack{edge.to};
  seen[edge.to] = true;
  while (!stack.empty()) {
    const std::size_t v = stack.back();
    stack.pop_back();
    if (v == edge.from) return true;
    for (const GraphEdge* next : out[v]) {
      if (!seen[next->to]) {
        seen[next->to] = true;
        stack.push_back(next->to);
      }
    }
  }
  return false;
}

void remove_edge(Graph& graph, const GraphEdge* edge) { std::erase(graph.edges, edge); }

// Kahn's algorithm, always taking the ready unit that comes first in the file, so the order is
// the one a reader of the flowsheet expects. Returns nothing if a cycle is left.
std::optional<std::vector<std::size_t>> topological_order(const Graph& graph) {
  std::vector<std::size_t> indegree(graph.vertices, 0);
  for (const GraphEdge* edge : graph.edges) ++indegree[edge->to];
  const auto out = graph.outgoing();
  std::vector<std::size_t> order;
  std::vector<bool> done(graph.vertices, false);
  while (order.size() < graph.vertices) {
    std::optional<std::size_t> next;
    for (std::size_t v = 0; v < graph.vertices; ++v) {
      if (!done[v] && indegree[v] == 0) {
        next = v;
        break;
      }
    }
    if (!next) return std::nullopt;
    done[*next] = true;
    order.push_back(*next);
    for (const GraphEdge* edge : out[*next]) --indegree[edge->to];
  }
  return order;
}

// Vertices reachable from the given ones (themselves included) along active edges, forwards or backwards.
std::vector<bool> reach(const Graph& graph, const std::vector<std::size_t>& from, bool forwards) {
  std::vector<bool> seen(graph.vertices, false);
  std::vector<std::size_t> stack;
  for (const std::size_t v : from) {
    if (!seen[v]) {
      seen[v] = true;
      stack.push_back(v);
    }
  }
  while (!stack.empty()) {
    const std::size_t v = stack.back();
    stack.pop_back();
    for (const GraphEdge* edge : graph.edges) {
      const std::size_t a = forwards ? edge->from : edge->to;
      const std::size_t b = forwards ? edge->to : edge->from;
      if (a == v && !seen[b]) {
        seen[b] = true;
        stack.push_back(b);
      }
    }
  }
  return seen;
}

}  // namespace

SolveOrder plan_solve_order(std::size_t unit_count, std::span<const GraphEdge> edges,
                            std::span<const std::size_t> preferred_tears, std::span<const std::size_t> forced_tears) {
  Graph graph{unit_count, {}};
  for (const GraphEdge& edge : edges) graph.edges.push_back(&edge);
  const auto edge_of = [&](std::size_t stream) -> const GraphEdge* {
    for (const GraphEdge& edge : edges) {
      if (edge.stream == stream) return &edge;
    }
    return nullptr;
  };

  std::vector<const GraphEdge*> tears;
  if (!forced_tears.empty()) {
    for (const std::size_t stream : forced_tears) {
      if (const GraphEdge* edge = edge_of(stream)) {
        tears.push_back(edge);
        remove_edge(graph, edge);
      }
    }
    const auto left = find_cycles(graph, 1);
    if (!left.empty()) {
      std::vector<std::size_t> cycle;
      for (const GraphEdge* edge : left.front()) cycle.push_back(edge->from);
      throw UnbrokenCycleError(std::move(cycle));
    }
  } else {
    for (const std::size_t stream : preferred_tears) {
      const GraphEdge* edge = edge_of(stream);
      if (edge != nullptr && on_some_cycle(graph, *edge)) {
        tears.push_back(edge);
        remove_edge(graph, edge);
      }
    }
    for (auto cycles = find_cycles(graph, cycle_sample_limit); !cycles.empty();
         cycles = find_cycles(graph, cycle_sample_limit)) {
      std::map<std::size_t, std::size_t> count;  // stream → cycles through it; ordered, so ties go to the lowest
      for (const auto& cycle : cycles) {
        for (const GraphEdge* edge : cycle) ++count[edge->stream];
      }
      const auto best = std::ranges::max_element(count, [](const auto& a, const auto& b) { return a.second < b.second; });
      const GraphEdge* edge = edge_of(best->first);
      tears.push_back(edge);
      remove_edge(graph, edge);
    }
  }

  SolveOrder order;
  for (const GraphEdge* edge : tears) order.tears.push_back(edge->stream);
  std::ranges::sort(order.tears);
  order.sequence = *topological_order(graph);  // acyclic now: every cycle has lost an edge

  std::vector<std::size_t> tear_sinks;
  std::vector<std::size_t> tear_sources;
  for (const GraphEdge* edge : tears) {
    tear_sinks.push_back(edge->to);
    tear_sources.push_back(edge->from);
  }
  const std::vector<bool> downstream = reach(graph, tear_sinks, true);
  const std::vector<bool> upstream = reach(graph, tear_sources, false);
  for (const std::size_t unit : order.sequence) {
    if (!downstream[unit]) {
      order.before.push_back(unit);
    } else if (upstream[unit]) {
      order.loop.push_back(unit);
    } else {
      order.after.push_back(unit);
    }
  }
  return order;
}

}  // namespace protonflow::host
