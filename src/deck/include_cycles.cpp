#include "deck/include_cycles.hpp"

#include <set>
#include <utility>

namespace deckscale {
namespace {

using Node = std::pair<std::size_t, std::string>;

class CycleSearch {
public:
    explicit CycleSearch(const std::vector<IncludeEdge>& edges) : edges_(edges) {}

    // True when a cycle was found below `node`; path_ then holds the chain.
    bool from(const Node& node) {
        on_chain_.insert(node);
        for (std::size_t i = 0; i < edges_.size(); ++i) {
            const IncludeEdge& e = edges_[i];
            if (e.from_file != node.first || e.from_section != node.second) continue;
            Node next{e.to_file, e.to_section};
            path_.push_back(i);
            if (on_chain_.count(next)) return true;
            if (!done_.count(next) && from(next)) return true;
            path_.pop_back();
        }
        on_chain_.erase(node);
        done_.insert(node);
        return false;
    }

    std::vector<std::size_t> take_path() { return std::move(path_); }

private:
    const std::vector<IncludeEdge>& edges_;
    std::set<Node> on_chain_, done_;
    std::vector<std::size_t> path_;
};

}  // namespace

std::vector<std::size_t> first_include_cycle(const std::vector<IncludeEdge>& edges) {
    CycleSearch search(edges);
    if (search.from(Node{0, ""})) return search.take_path();
    return {};
}

}  // namespace deckscale
