// ngspice as referee of the rule table's completeness: `devhelp <device>` lists every
// instance and model parameter ngspice 39 reads for the devices the table covers. Each one
// the table lacks would make a deck that uses it refused as "not in the rule table", so every
// listed name must be a row, or be in the list below of names handled elsewhere or refused on
// purpose, each with its reason.
#include <gtest/gtest.h>

#include <cctype>
#include <map>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include "scale/rules.hpp"
#include "support/devhelp.hpp"

namespace deckscale {
namespace {

struct Scopes {
    const char* instance;  // rule scope of the element card, "" for none
    const char* model;     // rule scope of its .model card, "" for none
};

// devhelp's device names and the table's scopes for them.
const std::map<std::string, Scopes>& devices() {
    static const std::map<std::string, Scopes> m{
        {"Resistor", {"r", "model:r"}}, {"Capacitor", {"c", "model:c"}},
        {"Inductor", {"l", "model:l"}}, {"mutual", {"k", ""}},
        {"Vsource", {"v", ""}},         {"Isource", {"i", ""}},
        {"VCVS", {"e", ""}},            {"VCCS", {"g", ""}},
        {"CCCS", {"f", ""}},            {"CCVS", {"h", ""}},
        {"ASRC", {"b", ""}},            {"Tranline", {"t", ""}},
        {"LTRA", {"o", "model:ltra"}},  {"URC", {"u", "model:urc"}},
        {"Switch", {"s", "model:sw"}},  {"CSwitch", {"w", "model:csw"}},
    };
    return m;
}

// Listed by devhelp, deliberately not rows of the table.
std::string why_not_a_row(const std::string& scope, const std::string& name) {
    static const std::set<std::string> functions{"pulse", "sin",  "sine",    "exp",     "pwl",
                                                 "sffm",  "am",   "trnoise", "trrandom"};
    if ((scope == "v" || scope == "i") && functions.count(name))
        return "a source function: its arguments have rows by position";
    if ((scope == "v" || scope == "i") && name == "external")
        return "refused: the host program supplies the values";
    if (scope == "v" && name == "pwr") return "an RF port's power: scale/sources.cpp";
    if (name.rfind("sens_", 0) == 0) return "a request flag of .sens";
    if (scope == "k" && (name == "inductor1" || name == "inductor2"))
        return "the coupled inductors' names";
    if ((scope == "f" || scope == "h" || scope == "w") && name == "control")
        return "the controlling source's name";
    if ((scope == "e" || scope == "g") && name == "ic")
        return "refused: libngspice 39 stops on it (\"no such parameter on this device\")";
    if (scope == "b" && (name == "i" || name == "v")) return "the behavioural expression";
    if ((scope == "t" || scope == "o") && name == "ic") return "IC=v1,i1,v2,i2: rows ic#1-4";
    if ((scope == "s" || scope == "w") &&
        (name == "on" || name == "off" || name == "pos_node" || name == "neg_node"))
        return "a state flag or a node";
    if (scope == "model:" + name || (scope == "model:sw" && name == "sw") ||
        (scope == "model:csw" && name == "csw"))
        return "the model type's own name";
    if (scope == "model:l" &&
        (name == "csect" || name == "dia" || name == "length" || name == "nt" || name == "mu"))
        return "refused: an inductance from the core's geometry has no one field to scale";
    return "";
}

TEST(RulesNgspiceTest, EveryParameterNgspiceReadsHasARowOrAReason) {
    std::vector<std::string> names;
    for (const auto& [device, scopes] : devices()) names.push_back(device);
    std::istringstream in(test::devhelp_listing(names));
    std::set<std::pair<std::string, std::string>> listed;  // (scope, name)
    std::string line;
    const Scopes* scopes = nullptr;
    const char* section = "";
    while (std::getline(in, line)) {
        std::istringstream f(line);
        std::string first, second, dir_field;
        f >> first >> second >> dir_field;
        if (second == "-" && devices().count(first)) {
            scopes = &devices().at(first);
            section = "";
        }
        if (!scopes) continue;
        if (line.rfind("Model Parameters", 0) == 0) section = scopes->model;
        if (line.rfind("Instance Parameters", 0) == 0) section = scopes->instance;
        bool row = !first.empty() && std::isdigit(static_cast<unsigned char>(first[0]));
        if (row && *section && (dir_field == "in" || dir_field == "inout"))
            listed.insert({section, second});
    }
    // The listing was read: a few rows every ngspice 39 has.
    EXPECT_GT(listed.size(), 150u);
    EXPECT_TRUE(listed.count({"r", "resistance"}));
    EXPECT_TRUE(listed.count({"v", "acmag"}));
    EXPECT_TRUE(listed.count({"model:ltra", "len"}));
    for (const auto& [scope, name] : listed) {
        if (find_rule(scope, name)) continue;
        EXPECT_NE(why_not_a_row(scope, name), "")
            << "ngspice 39 reads '" << name << "' (" << scope << ") and the table has no row";
    }
}

}  // namespace
}  // namespace deckscale
