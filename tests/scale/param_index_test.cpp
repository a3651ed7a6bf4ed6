// Where a deck defines and uses its parameters (scale/param_index): scopes, the names a
// subcircuit takes from elsewhere, X-line overrides and the places that are not values.
#include "scale/param_index.hpp"

#include <gtest/gtest.h>

namespace deckscale {
namespace {

struct Indexed {
    Deck deck;
    ParamIndex index;
};

Indexed index_of(const std::string& text) {
    MemoryFileSystem fs;
    fs.add("deck.cir", text);
    Indexed r{load_deck("deck.cir", fs), {}};
    r.index = index_params(r.deck);
    return r;
}

std::string param_name(const ParamIndex& x, std::optional<int> id) {
    if (!id) return "-";
    const ParamInfo& p = x.params[*id];
    return (p.scope ? x.scopes[p.scope].subckt + "." : "") + p.name;
}

// ngspice 39 takes a name a subcircuit does not define from the calling chain (tried with
// `ngspice -b`: {r} in a top-level subcircuit called from one with params: r=5k gave 5k,
// not the global 1k): a name defined in one scope only is that one; in several, ambiguous.
TEST(ParamIndex, ResolvesNamesByScope) {
    auto r = index_of(
        "t\n.param r=1k g=2\n.subckt a p q params: r=5k\nR1 p q {r}\n.ends\n"
        ".subckt b p q params: c=1n\nC1 p q {c*g}\nR2 p q {r}\n.ends\n.end\n");
    const ParamIndex& x = r.index;
    ASSERT_EQ(x.scopes.size(), 3u);
    std::set<int> ambiguous;
    EXPECT_EQ(param_name(x, x.resolve("r", 0, ambiguous)), "r");
    EXPECT_EQ(param_name(x, x.resolve("r", 1, ambiguous)), "a.r");
    EXPECT_EQ(param_name(x, x.resolve("g", 2, ambiguous)), "g");
    EXPECT_EQ(param_name(x, x.resolve("c", 0, ambiguous)), "-");  // not seen at the top level
    EXPECT_TRUE(ambiguous.empty());
    x.resolve("r", 2, ambiguous);  // b uses r: the global one or a's, by the caller
    EXPECT_EQ(ambiguous.size(), 2u);
    // Where each card is: a's body, b's body, after both.
    std::string text(r.deck.top().text());
    EXPECT_EQ(x.scope_at(0, static_cast<std::uint32_t>(text.find("R1"))), 1);
    EXPECT_EQ(x.scope_at(0, static_cast<std::uint32_t>(text.find("C1"))), 2);
    EXPECT_EQ(x.scope_at(0, static_cast<std::uint32_t>(text.find(".end\n"))), 0);
}

TEST(ParamIndex, OverridesDefineTheSubcircuitsParameters) {
    auto r = index_of(
        "t\nX1 a b cell r={rx} m=2\nX2 a b nosuch r=1k\n.subckt cell p q params: r=1k\n"
        "R1 p q {r}\n.ends\n.param rx=3k\n.end\n");
    const ParamIndex& x = r.index;
    std::vector<std::string> defs;
    for (const auto& d : x.definitions)
        defs.push_back(param_name(x, d.param) + "=" +
                       std::string(r.deck.top().view(d.value.begin, d.value.end)) + "@" +
                       std::to_string(d.scope));
    EXPECT_EQ(defs, (std::vector<std::string>{"cell.r=1k@1", "rx=3k@0", "cell.r={rx}@0"}));
    std::vector<std::string> refs;
    for (const auto& f : x.refs)
        refs.push_back(std::string(r.deck.top().view(f.begin, f.end)) + ":" +
                       std::to_string(static_cast<int>(f.kind)));
    // m=2 is not cell's parameter (kept as written); nosuch is not defined (opaque).
    EXPECT_EQ(refs, (std::vector<std::string>{"{r}:0", "2:0", "1k:2"}));
}

TEST(ParamIndex, ControlWordsConditionsAndFunctions) {
    auto r = index_of(
        "t\n.param rv=1k\n.func par(a,b) {a*b/(a+b)}\n.if (rv > 500)\nR1 x 0 rv\n.endif\n"
        ".control\nalterparam rv=2k\n.endc\n.end\n");
    const ParamIndex& x = r.index;
    ASSERT_EQ(x.control_words.size(), 1u);
    EXPECT_EQ(x.control_words[0].first, "rv");
    ASSERT_NE(x.function("par"), nullptr);
    EXPECT_EQ(x.function("par")->args, (std::vector<std::string>{"a", "b"}));
    EXPECT_EQ(x.function("par")->body, "a*b/(a+b)");
    ASSERT_EQ(x.refs.size(), 2u);
    EXPECT_EQ(x.refs[0].kind, ParamRef::Kind::condition);
    EXPECT_EQ(r.deck.top().view(x.refs[0].begin, x.refs[0].end), "(rv > 500)");
    EXPECT_EQ(r.deck.top().view(x.refs[1].begin, x.refs[1].end), "rv");
}

TEST(ParamIndex, AnIncludeInsideASubcircuitStopsThePlan) {
    MemoryFileSystem fs;
    fs.add("deck.cir", "t\n.subckt s p q\n.include part.inc\n.ends\n.end\n");
    fs.add("part.inc", "R1 p q {r}\n");
    Deck deck = load_deck("deck.cir", fs);
    EXPECT_EQ(index_params(deck).no_plan,
              ".include inside a .subckt at deck.cir:3 brings in cards whose scope deckscale "
              "does not follow");
}

}  // namespace
}  // namespace deckscale
