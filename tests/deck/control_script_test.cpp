// Splitting a .control block into commands and words, with spans into the file (ngspice 39
// manual 17.4.1 ';', 17.5.10 '+' lines, 2.3.4 '$ ' comments inside .control).
#include "deck/control_script.hpp"

#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "deck/load.hpp"

namespace deckscale {
namespace {

// Each command as "line:col word|word|...", fields joined by '|'.
std::vector<std::string> commands_of(const std::string& body) {
    MemoryFileSystem fs;
    fs.add("c.cir", "t\n.control\n" + body + ".endc\n.end\n");
    Deck d = load_deck("c.cir", fs);
    std::vector<std::string> out;
    d.visit_file(0, [&](const Card& c) {
        if (c.kind != CardKind::control) return;
        for (const auto& t : c.tokens) {
            if (t.kind != TokenKind::control) continue;
            for (const auto& cmd : control_commands(*c.file, t)) {
                auto pos = c.file->position(cmd.fields.front().begin);
                auto line = c.file->position(cmd.line_begin);
                EXPECT_EQ(line.line, pos.line);
                EXPECT_EQ(line.column, 1u);
                std::string s = std::to_string(pos.line) + ":" + std::to_string(pos.column) + " ";
                for (std::size_t i = 0; i < cmd.fields.size(); ++i)
                    s += (i ? "|" : "") + std::string(c.text(cmd.fields[i]));
                out.push_back(s);
            }
        }
    });
    return out;
}

TEST(ControlScript, SplitsCommandsAndWords) {
    struct Case {
        int line;
        std::string body;
        std::vector<std::string> commands;
    };
    const Case cases[] = {
        {__LINE__, "ac dec 10 1 1k\n", {"3:1 ac|dec|10|1|1k"}},
        {__LINE__, "  run\n\n\nprint v(out)\n", {"3:3 run", "6:1 print|v|(|out|)"}},
        {__LINE__, "op; print v(2) ;echo x\n", {"3:1 op", "3:5 print|v|(|2|)", "3:17 echo|x"}},
        {__LINE__, "tran 1u\n+ 2m\n", {"3:1 tran|1u|2m"}},
        {__LINE__, "tran 1u\n* between\n  + 2m uic\n", {"3:1 tran|1u|2m|uic"}},
        {__LINE__, "* only a comment\nrun $ comment 1k\n", {"4:1 run"}},
        {__LINE__, "let a = $fstop\n", {"3:1 let|a|=|$fstop"}},
        {__LINE__,
         "meas tran t1 trig v(out)=0.5 td=1u\n",
         {"3:1 meas|tran|t1|trig|v|(|out|)|=|0.5|td|=|1u"}},
        {__LINE__, "echo \"a; b\" done\r\nrun\r\n", {"3:1 echo|\"a; b\"|done", "4:1 run"}},
        {__LINE__, "alter @r1[resistance]=2k\n", {"3:1 alter|@r1[resistance]|=|2k"}},
        {__LINE__, "\n", {}},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "control_script_test.cpp:" << c.line << ": " << c.body);
        EXPECT_EQ(commands_of(c.body), c.commands);
    }
}

TEST(ControlScript, TokensOfACommandRebuildItsBytes) {
    std::string text = "t\n.control\ntran 1u\t2m\r\n  + 3m ; run\nop\n.endc\n.end\n";
    MemoryFileSystem fs;
    fs.add("c.cir", text);
    Deck d = load_deck("c.cir", fs);
    std::vector<std::string> rebuilt;
    d.visit_file(0, [&](const Card& c) {
        for (const auto& t : c.tokens)
            if (t.kind == TokenKind::control)
                for (const auto& cmd : control_commands(*c.file, t)) {
                    std::string s;
                    for (const auto& k : cmd.tokens) s += c.text(k);
                    rebuilt.push_back(s);
                }
    });
    EXPECT_EQ(rebuilt, (std::vector<std::string>{"tran 1u\t2m\r\n  + 3m ", "run\n", "op\n"}));
}

TEST(ControlScript, FirstLiteral) {
    struct Case {
        int line;
        std::string word;
        std::size_t at;
    };
    const auto none = std::string_view::npos;
    const Case cases[] = {
        {__LINE__, "5*2", 0},    {__LINE__, "2*pi*frequency", 0},
        {__LINE__, "v2", none},  {__LINE__, "out_3", none},
        {__LINE__, "n#2", none}, {__LINE__, "x/1k", 2},
        {__LINE__, ".5", 0},     {__LINE__, "a.5", none},
        {__LINE__, "-1e-3", 1},  {__LINE__, "lin-tstart", none},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "control_script_test.cpp:" << c.line << ": " << c.word);
        EXPECT_EQ(first_literal(c.word), c.at);
    }
}

}  // namespace
}  // namespace deckscale
