#include "batch/junit.hpp"

#include <fmt/format.h>

#include <pugixml.hpp>
#include <sstream>

namespace deckscale {
namespace {

std::string seconds(double s) { return fmt::format("{:.3f}", s); }

// The one-line message of a case that did not meet its expectation.
std::string message_of(const CaseResult& c) {
    std::string first = c.problems.empty() ? "" : c.problems.front();
    if (auto nl = first.find('\n'); nl != std::string::npos) first.resize(nl);
    switch (c.outcome) {
        case CaseOutcome::pass:
            return "expected to fail, but equivalent; worst " + c.worst;
        case CaseOutcome::fail:
            return "not equivalent; worst " + c.worst;
        case CaseOutcome::refused:
            return "refused: " + first;
        case CaseOutcome::error:
            return first;
    }
    return first;
}

std::string details_of(const CaseResult& c) {
    std::string s = fmt::format("deck: {}\n", c.deck);
    if (!c.scaled.empty()) s += fmt::format("scaled: {}\n", c.scaled);
    s += fmt::format("Km = {:.9g}, Kf = {:.9g}\nexpected: {}, outcome: {}\n", c.km, c.kf,
                     to_string(c.expect), to_string(c.outcome));
    if (!c.worst.empty()) s += "worst: " + c.worst + "\n";
    for (const auto& p : c.problems) s += p + "\n";
    return s;
}

}  // namespace

std::string junit_xml(const BatchReport& r) {
    std::size_t failures = 0, errors = 0;
    double total = 0;
    for (const auto& c : r.cases) {
        total += c.seconds;
        if (c.met()) continue;
        (c.outcome == CaseOutcome::pass || c.outcome == CaseOutcome::fail ? failures : errors)++;
    }
    pugi::xml_document doc;
    auto decl = doc.append_child(pugi::node_declaration);
    decl.append_attribute("version") = "1.0";
    decl.append_attribute("encoding") = "UTF-8";
    auto suites = doc.append_child("testsuites");
    suites.append_attribute("name") = "deckscale batch";
    suites.append_attribute("tests") = static_cast<unsigned long long>(r.cases.size());
    suites.append_attribute("failures") = static_cast<unsigned long long>(failures);
    suites.append_attribute("errors") = static_cast<unsigned long long>(errors);
    suites.append_attribute("time") = seconds(total).c_str();
    auto suite = suites.append_child("testsuite");
    suite.append_attribute("name") = r.name.c_str();
    suite.append_attribute("tests") = static_cast<unsigned long long>(r.cases.size());
    suite.append_attribute("failures") = static_cast<unsigned long long>(failures);
    suite.append_attribute("errors") = static_cast<unsigned long long>(errors);
    suite.append_attribute("skipped") = 0;
    suite.append_attribute("time") = seconds(total).c_str();
    auto props = suite.append_child("properties");
    auto prop = [&](const char* name, const std::string& value) {
        auto p = props.append_child("property");
        p.append_attribute("name") = name;
        p.append_attribute("value") = value.c_str();
    };
    prop("suite", r.suite);
    prop("shard", fmt::format("{}/{}", r.shard.k, r.shard.n));
    for (const auto& c : r.cases) {
        auto t = suite.append_child("testcase");
        t.append_attribute("name") = c.name.c_str();
        t.append_attribute("classname") = ("deckscale." + r.name).c_str();
        t.append_attribute("time") = seconds(c.seconds).c_str();
        if (!c.met()) {
            bool compared = c.outcome == CaseOutcome::pass || c.outcome == CaseOutcome::fail;
            auto f = t.append_child(compared ? "failure" : "error");
            f.append_attribute("message") = message_of(c).c_str();
            f.append_attribute("type") = to_string(c.outcome);
            f.append_child(pugi::node_pcdata).set_value(details_of(c).c_str());
        } else {
            t.append_child("system-out")
                .append_child(pugi::node_pcdata)
                .set_value(details_of(c).c_str());
        }
    }
    std::ostringstream out;
    doc.save(out, "  ", pugi::format_default, pugi::encoding_utf8);
    return out.str();
}

}  // namespace deckscale
