// Where a deck defines its parameters and where it uses them, with their scopes: global
// `.param`, a subcircuit's `params:` defaults and its own `.param` cards, X-line overrides,
// `.func` definitions, and every other place a parameter can appear. ngspice 39 looks a name
// up by the calling chain, not by the text (tried with `ngspice -b`: a subcircuit defined at
// the top level that uses `{r}` without defining it takes `r` from the subcircuit that
// instantiates it, 5k over a global 1k): so a name a subcircuit uses but does not define is
// only known when one scope defines it.
#pragma once

#include <cstdint>
#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "deck/load.hpp"
#include "scale/param_dims.hpp"

namespace deckscale {

// A place in the deck, for messages.
struct ParamSite {
    std::size_t file = 0;
    std::uint32_t offset = 0;
    std::string element;  // first field of the card as written ("R1", ".param", "X2")
};

struct ParamInfo {
    int scope = 0;        // 0: global; else a subcircuit (ParamIndex::scopes)
    std::string name;     // lower case
    std::string written;  // as first written
    ParamSite defined;    // the name in its first definition
};

// A place that gives a parameter its value.
struct ParamDefinition {
    int param = 0;
    ParamSite site;
    Token value{};  // the value token (word, {expr} or 'expr')
    int scope = 0;  // where the value's names are looked up
};

// A value that is not a definition and may name parameters.
struct ParamRef {
    enum class Kind : std::uint8_t {
        value,      // must follow what the scaling pass does to it (unchanged if nothing)
        condition,  // .if/.elseif: must decide the same way
        opaque,     // its scaling is not known (.csparam, an override of an unknown subcircuit)
    };
    Kind kind = Kind::value;
    ParamSite site;
    std::uint32_t begin = 0, end = 0;  // the text in the file
    int scope = 0;
    std::string why;  // for opaque
};

struct ParamScope {
    std::string subckt;  // lower case; empty for the global scope
};

class ParamIndex {
public:
    std::vector<ParamScope> scopes{ParamScope{}};
    std::vector<ParamInfo> params;
    std::vector<ParamDefinition> definitions;
    std::vector<ParamRef> refs;
    std::vector<std::pair<std::string, ParamSite>> control_words;  // names in .control blocks
    std::string no_plan;  // set: no parameter can be planned (why)

    // The scope a byte of a file is in.
    int scope_at(std::size_t file, std::uint32_t offset) const;
    // The parameter `name` (lower case) stands for in `scope`. With several candidates (a
    // subcircuit using a name that more than one scope defines) they are all added to
    // `ambiguous` and the first is returned.
    std::optional<int> resolve(const std::string& name, int scope, std::set<int>& ambiguous) const;
    // The .func of that name (nullptr if none, or defined more than once).
    const UserFunction* function(const std::string& name) const;
    // Parameter id of (scope, name), created on first use.
    int param(int scope, const std::string& name, const ParamSite& site, std::string_view written);
    bool has_param(int scope, const std::string& name) const {
        return by_key_.count({scope, name}) != 0;
    }

    std::vector<std::vector<std::pair<std::uint32_t, int>>> transitions;  // per file
    std::map<std::string, std::vector<int>> subckts;  // subcircuit name -> its scopes
    std::map<std::string, std::vector<UserFunction>> functions;

private:
    std::map<std::pair<int, std::string>, int> by_key_;
    std::map<std::string, std::vector<int>> by_name_;
};

ParamIndex index_params(const Deck& deck);

}  // namespace deckscale
