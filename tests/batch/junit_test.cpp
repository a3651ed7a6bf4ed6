// JUnit XML: read back by a general XML parser (pugixml), with the elements and attributes
// the JUnit schema requires (testsuite: name, tests, failures, errors, time; testcase: name,
// classname, time; failure/error: message, type), counts that agree with the cases, and
// text that survives XML's special characters.
#include "batch/junit.hpp"

#include <gtest/gtest.h>

#include <pugixml.hpp>

namespace deckscale {
namespace {

CaseResult result(std::size_t index, const std::string& name, CaseOutcome outcome, Expect expect) {
    CaseResult r;
    r.index = index;
    r.name = name;
    r.deck = "refs/" + name + ".cir";
    r.expect = expect;
    r.outcome = outcome;
    r.seconds = 1.5;
    r.worst = "ac v(n2): relative error 0.0102 at 1.6e+07 (tolerance 1e-06)";
    if (outcome == CaseOutcome::error)
        r.problems = {"simulating x.cir (ac) failed: timed out: <&\"'>"};
    return r;
}

TEST(BatchJunit, ReadBackWithTheRequiredElements) {
    BatchReport r;
    r.suite = "lib/suite.toml";
    r.name = "suite";
    r.suite_cases = 4;
    r.cases = {result(0, "ok", CaseOutcome::pass, Expect::pass),
               result(1, "broken as meant", CaseOutcome::fail, Expect::fail),
               result(2, "C3 1 % high", CaseOutcome::fail, Expect::pass),
               result(3, "hung <&>", CaseOutcome::error, Expect::pass)};
    std::string xml = junit_xml(r);
    pugi::xml_document doc;
    ASSERT_TRUE(doc.load_string(xml.c_str())) << xml;
    auto suites = doc.child("testsuites");
    ASSERT_TRUE(suites) << xml;
    EXPECT_STREQ(suites.attribute("tests").value(), "4");
    auto suite = suites.child("testsuite");
    ASSERT_TRUE(suite);
    for (const char* a : {"name", "tests", "failures", "errors", "time"})
        EXPECT_TRUE(suite.attribute(a)) << a;
    EXPECT_STREQ(suite.attribute("name").value(), "suite");
    EXPECT_EQ(suite.attribute("tests").as_int(), 4);
    EXPECT_EQ(suite.attribute("failures").as_int(), 1);
    EXPECT_EQ(suite.attribute("errors").as_int(), 1);
    EXPECT_DOUBLE_EQ(suite.attribute("time").as_double(), 6.0);
    std::vector<std::string> names;
    int failures = 0, errors = 0;
    for (auto t : suite.children("testcase")) {
        for (const char* a : {"name", "classname", "time"}) EXPECT_TRUE(t.attribute(a)) << a;
        EXPECT_STREQ(t.attribute("classname").value(), "deckscale.suite");
        names.push_back(t.attribute("name").value());
        if (auto f = t.child("failure")) {
            ++failures;
            EXPECT_STREQ(f.attribute("message").value(),
                         "not equivalent; worst ac v(n2): relative error 0.0102 at 1.6e+07 "
                         "(tolerance 1e-06)");
            EXPECT_STREQ(f.attribute("type").value(), "fail");
        }
        if (auto e = t.child("error")) {
            ++errors;
            EXPECT_STREQ(e.attribute("message").value(),
                         "simulating x.cir (ac) failed: timed out: <&\"'>");
            EXPECT_NE(std::string(e.child_value()).find("expected: pass, outcome: error"),
                      std::string::npos);
        }
    }
    EXPECT_EQ(names,
              (std::vector<std::string>{"ok", "broken as meant", "C3 1 % high", "hung <&>"}));
    EXPECT_EQ(failures, 1);
    EXPECT_EQ(errors, 1);
}

}  // namespace
}  // namespace deckscale
