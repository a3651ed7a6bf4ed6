// Tests of the A-device connection reader and the port factors (ngspice 39 manual §12.1,
// Table 12.1; shared notes "codemodel-rules.md" §1 and pitfall 2).
#include "scale/codemodel_ports.hpp"

#include <gtest/gtest.h>

#include "deck/card_reader.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

// The connection items of the first card of a one-card deck.
std::vector<std::string> items_of(const std::string& card) {
    SourceFile file("deck.cir", "t\n" + card + "\n");
    std::vector<std::string> out;
    read_cards(file, FileRole::deck, [&](const Card& c) {
        if (c.kind != CardKind::element) return;
        for (auto s : connection_items(c)) out.emplace_back(s);
    });
    return out;
}

std::string joined(const InstancePorts& ports) {
    std::string s;
    for (const auto& p : ports) {
        s += s.empty() ? "" : " ";
        s += "[";
        for (std::size_t k = 0; k < p.size(); ++k) s += (k ? "," : "") + p[k];
        s += "]";
    }
    return s;
}

TEST(CodeModelPortsTest, ReadsPortTypesAsNgspiceDoes) {
    struct Row {
        int line;
        std::string type, card, ports;  // ports: "" when the card does not fit the model
    };
    const Row rows[] = {
        {__LINE__, "gain", "a1 %v(in) %i(o) m", "[v] [i]"},
        {__LINE__, "gain", "a1 in o m", "[v] [v]"},  // model defaults
        {__LINE__, "gain", "a1 %vnam(Vs) %vd(o 0) m", "[vnam] [vd]"},
        {__LINE__, "gain", "a1 %v(x) null m", "[v] [null]"},
        {__LINE__, "gain", "a1 %id (a b) %hd(c, d) m", "[id] [hd]"},
        // A modifier inside [ ] holds for that port and the following ones of the vector;
        // the next connection starts again from the model's default.
        {__LINE__, "summer", "a1 [%v in %i ni %vd a 0] %i(o1) m", "[v,i,vd] [i]"},
        {__LINE__, "summer", "a1 %i [a b %vd c d] o m", "[i,i,vd] [v]"},
        {__LINE__, "summer", "a1 [a b] o m", "[v,v] [v]"},
        {__LINE__, "summer", "a1 %vd [1 2 3 4] o m", "[vd,vd] [v]"},
        {__LINE__, "summer", "a1 [ a null b ] o m", "[v,null,v] [v]"},
        {__LINE__, "dac_bridge", "a1 [q] %i([aout2]) m", "[d] [i]"},
        {__LINE__, "zener", "a1 (z 0) m", "[gd]"},
        {__LINE__, "zener", "a1 z m", ""},         // %gd needs two nodes
        {__LINE__, "gain", "a1 in m", ""},         // out is not connected
        {__LINE__, "gain", "a1 in o p m", ""},     // one connection too many
        {__LINE__, "summer", "a1 a b o m", ""},    // a vector port needs [ ]
        {__LINE__, "summer", "a1 [a b o m", ""},   // ']' missing
        {__LINE__, "gain", "a1 %q(in) o m", ""},   // no such port type
        {__LINE__, "gain", "a1 %vd(in) o m", ""},  // one node for %vd
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "codemodel_ports_test.cpp:" << r.line << ": " << r.card);
        const CodeModelType* t = find_code_model(r.type);
        ASSERT_NE(t, nullptr);
        std::vector<std::string> owned = items_of(r.card);
        std::vector<std::string_view> items(owned.begin(), owned.end());
        InstancePorts ports;
        std::string why;
        bool ok = read_ports(items, port_specs(*t), ports, why);
        EXPECT_EQ(ok, !r.ports.empty()) << why;
        if (ok) EXPECT_EQ(joined(ports), r.ports);
        if (!ok) EXPECT_FALSE(why.empty());
    }
}

TEST(CodeModelPortsTest, ListsTheNodesOfEachPort) {
    std::vector<std::string> owned = items_of("a1 [%v in %I ni %vd A 0] %i(o1) m");
    std::vector<std::string_view> items(owned.begin(), owned.end());
    InstancePorts ports;
    std::string why;
    std::vector<PortNode> nodes;
    ASSERT_TRUE(read_ports(items, port_specs(*find_code_model("summer")), ports, why, &nodes));
    std::string listed;
    for (const auto& n : nodes) listed += n.node + ":" + n.type + " ";
    EXPECT_EQ(listed, "in:v ni:i a:vd 0:vd o1:i ");
}

TEST(CodeModelPortsTest, PortFactorsFollowTable12_1) {
    // What the block reads on an input, what it drives on an output: %v/%vd a voltage, %i/%id a
    // current, %g reads a voltage and drives a current (VCCS), %h the reverse (CCVS), %vnam
    // reads the current of a voltage source; digital and real ports carry no unit.
    ScaleFactors f{4, 9};
    struct Row {
        int line;
        std::string type;
        PortDir dir;
        double factor;
    };
    const Row rows[] = {
        {__LINE__, "v", PortDir::in, 1},       {__LINE__, "vd", PortDir::in, 1},
        {__LINE__, "i", PortDir::in, 0.25},    {__LINE__, "id", PortDir::in, 0.25},
        {__LINE__, "vnam", PortDir::in, 0.25}, {__LINE__, "g", PortDir::in, 1},
        {__LINE__, "gd", PortDir::in, 1},      {__LINE__, "h", PortDir::in, 0.25},
        {__LINE__, "hd", PortDir::in, 0.25},   {__LINE__, "d", PortDir::in, 1},
        {__LINE__, "v", PortDir::out, 1},      {__LINE__, "vd", PortDir::out, 1},
        {__LINE__, "i", PortDir::out, 0.25},   {__LINE__, "id", PortDir::out, 0.25},
        {__LINE__, "g", PortDir::out, 0.25},   {__LINE__, "gd", PortDir::out, 0.25},
        {__LINE__, "h", PortDir::out, 1},      {__LINE__, "hd", PortDir::out, 1},
        {__LINE__, "real", PortDir::out, 1},
    };
    for (const auto& r : rows)
        EXPECT_DOUBLE_EQ(port_factor(r.type, r.dir, f), r.factor)
            << "codemodel_ports_test.cpp:" << r.line << ": " << r.type;
}

TEST(CodeModelPortsTest, FactorExpressions) {
    const CodeModelType* t = find_code_model("summer");
    auto specs = port_specs(*t);
    InstancePorts ports{{"v", "i", "null"}, {"i"}};
    ScaleFactors f{4, 10};
    struct Row {
        int line;
        std::string expr;
        std::size_t k, n;
        double factor;
    };
    const Row rows[] = {
        {__LINE__, "1", 0, 1, 1},
        {__LINE__, "Km", 0, 1, 4},
        {__LINE__, "1/Km/Kf", 0, 1, 0.025},
        {__LINE__, "out", 0, 1, 0.25},
        {__LINE__, "out/in", 0, 1, 0.25},  // "in" alone: its first element
        {__LINE__, "in[]", 1, 3, 0.25},
        {__LINE__, "1/in[]", 1, 3, 4},
        {__LINE__, "in[]", 2, 3, 1},  // an open connection takes the default type
        {__LINE__, "in[]", 5, 6, 1},  // past the connections too
        {__LINE__, "out*Kf^rest", 0, 3, 25},
        {__LINE__, "out*Kf^rest", 2, 3, 0.25},
        {__LINE__, "out*Km*Kf", 0, 1, 10},
    };
    for (const auto& r : rows)
        EXPECT_DOUBLE_EQ(eval_factor(r.expr, specs, &ports, f, r.k, r.n), r.factor)
            << "codemodel_ports_test.cpp:" << r.line << ": " << r.expr;
    EXPECT_DOUBLE_EQ(eval_factor("out", specs, nullptr, f, 0, 1), 1);  // defaults: %v
}

}  // namespace
}  // namespace deckscale
