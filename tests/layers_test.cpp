// The tree is the pipeline: each folder under src/ is one stage, and a stage may include only
// the stages below it that its row in kLayers names (the same map opens DEVELOPERS.md). This
// test reads every source file's quoted includes and fails on a back edge, on an include that
// does not name its folder, on a folder the map does not know, and on <ngspice/...> outside
// sim/. It runs in CI with the rest of the suite.
#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <map>
#include <regex>
#include <set>
#include <sstream>
#include <string>
#include <vector>

namespace deckscale {
namespace {

namespace fs = std::filesystem;

// Folder -> the folders its files may include (besides its own). Pipeline order.
const std::map<std::string, std::set<std::string>> kLayers = {
    {"grammar", {}},
    {"base", {}},
    {"deck", {"base", "grammar"}},
    {"write", {"base", "deck"}},
    {"scale", {"base", "deck", "write"}},
    {"sim", {"base"}},
    {"verify", {"base", "deck", "write", "scale", "sim"}},
    {"values", {"base", "deck", "write", "scale"}},
    {"retarget", {"base", "deck", "write", "scale", "sim", "verify", "values"}},
    {"yield", {"base", "deck", "sim", "verify"}},
    {"stress", {"base", "deck", "sim", "verify"}},
    {"batch", {"base", "deck", "write", "scale", "sim", "verify"}},
    {"deckscale", {"base", "deck", "write", "scale", "sim", "verify"}},
    {"cli", {"base", "deck", "write", "scale", "sim", "verify", "values", "retarget", "yield",
             "stress", "batch"}},
};

// What `cmake --install` puts in include/deckscale/ (CMakeLists.txt), with the file each is
// made from. A consumer has only these: each may include standard headers and the others.
const std::map<std::string, std::string> kPublicHeaders = {
    {"deckscale/deck.hpp", "src/deckscale/deck.hpp"},
    {"deckscale/scale.hpp", "src/deckscale/scale.hpp"},
    {"deckscale/verify.hpp", "src/deckscale/verify.hpp"},
    {"deckscale/diagnostic.hpp", "src/deck/diagnostic.hpp"},
};

struct SourceText {
    std::string path;  // relative to the top of the tree: "src/deck/card.hpp", "grammar/x.hpp"
    std::string text;
};

// The stage a file belongs to: "src/<stage>/..." or "grammar/...". Empty when it has none.
std::string stage_of(const std::string& path) {
    if (path.rfind("grammar/", 0) == 0) return "grammar";
    if (path.rfind("src/", 0) != 0) return "";
    auto slash = path.find('/', 4);
    return slash == std::string::npos ? "" : path.substr(4, slash - 4);
}

// Every violation of the layering rules, one line each ("file:line: what").
std::vector<std::string> layer_violations(const std::vector<SourceText>& files) {
    std::vector<std::string> out;
    std::set<std::string> known;
    for (const auto& f : files) known.insert(f.path);
    const std::regex quoted(R"(^\s*#\s*include\s*"([^"]+)\")");
    const std::regex engine(R"(^\s*#\s*include\s*<ngspice/)");
    for (const auto& f : files) {
        std::string stage = stage_of(f.path);
        if (stage.empty()) {
            out.push_back(f.path + ": not in a stage folder (src/<stage>/ or grammar/)");
            continue;
        }
        auto row = kLayers.find(stage);
        if (row == kLayers.end()) {
            out.push_back(f.path + ": folder '" + stage +
                          "' is not in the layer map (add it to kLayers and DEVELOPERS.md)");
            continue;
        }
        std::istringstream lines(f.text);
        std::string line;
        for (int n = 1; std::getline(lines, line); ++n) {
            std::string where = f.path + ":" + std::to_string(n) + ": ";
            std::smatch m;
            if (std::regex_search(line, engine) && stage != "sim")
                out.push_back(where + "only sim/ may include ngspice's headers");
            if (!std::regex_search(line, m, quoted)) continue;
            std::string target = m[1];
            std::string target_path = target.rfind("grammar/", 0) == 0 ? target : "src/" + target;
            std::string target_stage = stage_of(target_path);
            if (target_stage.empty() || target.find('/') == std::string::npos) {
                out.push_back(where + "include \"" + target + "\" does not name its folder");
                continue;
            }
            if (!known.count(target_path)) {
                out.push_back(where + "include \"" + target + "\" names no file of the tree");
                continue;
            }
            if (target_stage != stage && !row->second.count(target_stage))
                out.push_back(where + stage + "/ may not include " + target_stage + "/ (\"" + target +
                              "\"): a back edge");
        }
    }
    return out;
}

std::vector<SourceText> read_tree() {
    std::vector<SourceText> files;
    const fs::path top = DECKSCALE_SOURCE_DIR;
    for (const char* dir : {"src", "grammar"}) {
        for (const auto& e : fs::recursive_directory_iterator(top / dir)) {
            auto ext = e.path().extension();
            if (!e.is_regular_file() || (ext != ".cpp" && ext != ".hpp")) continue;
            std::ifstream in(e.path(), std::ios::binary);
            std::ostringstream text;
            text << in.rdbuf();
            files.push_back({fs::relative(e.path(), top).generic_string(), text.str()});
        }
    }
    std::sort(files.begin(), files.end(), [](auto& a, auto& b) { return a.path < b.path; });
    return files;
}

std::string joined(const std::vector<std::string>& lines) {
    std::string s;
    for (const auto& l : lines) s += l + "\n";
    return s;
}

TEST(Layers, TheTreeHasNoBackEdge) {
    auto files = read_tree();
    ASSERT_GT(files.size(), 50u);
    auto violations = layer_violations(files);
    EXPECT_TRUE(violations.empty()) << joined(violations);
}

// Every quoted include of an installed header that is not another installed header, and
// every angle-bracket include that is not a standard header (no '.' and no '/').
std::vector<std::string> public_header_violations(const std::vector<SourceText>& files) {
    std::vector<std::string> out;
    const std::regex quoted(R"(^\s*#\s*include\s*"([^"]+)\")");
    const std::regex angle(R"(^\s*#\s*include\s*<([^>]+)>)");
    for (const auto& f : files) {
        bool installed = false;
        for (const auto& [name, path] : kPublicHeaders) installed = installed || path == f.path;
        if (!installed) continue;
        std::istringstream lines(f.text);
        std::string line;
        for (int n = 1; std::getline(lines, line); ++n) {
            std::smatch m;
            std::string where = f.path + ":" + std::to_string(n) + ": ";
            if (std::regex_search(line, m, quoted) && !kPublicHeaders.count(m[1]))
                out.push_back(where + "an installed header includes \"" + std::string(m[1]) +
                              "\", which is not installed");
            if (std::regex_search(line, m, angle) &&
                std::string(m[1]).find_first_of("./") != std::string::npos)
                out.push_back(where + "an installed header includes <" + std::string(m[1]) +
                              ">, which a consumer may not have");
        }
    }
    return out;
}

TEST(Layers, InstalledHeadersIncludeOnlyEachOtherAndTheStandardLibrary) {
    auto files = read_tree();
    for (const auto& [name, path] : kPublicHeaders)
        EXPECT_TRUE(std::any_of(files.begin(), files.end(),
                                [&](const SourceText& f) { return f.path == path; }))
            << path;
    auto violations = public_header_violations(files);
    EXPECT_TRUE(violations.empty()) << joined(violations);
    // The checker itself, on an invented header.
    std::vector<SourceText> tree = {{"src/deckscale/scale.hpp",
                                     "#include <string>\n#include \"deckscale/deck.hpp\"\n"
                                     "#include \"deck/load.hpp\"\n#include <fmt/format.h>\n"}};
    EXPECT_EQ(joined(public_header_violations(tree)),
              "src/deckscale/scale.hpp:3: an installed header includes \"deck/load.hpp\", which "
              "is not installed\n"
              "src/deckscale/scale.hpp:4: an installed header includes <fmt/format.h>, which a "
              "consumer may not have\n");
}

TEST(Layers, EveryStageFolderIsInTheMap) {
    for (const auto& e : fs::directory_iterator(fs::path(DECKSCALE_SOURCE_DIR) / "src")) {
        if (e.is_directory())
            EXPECT_TRUE(kLayers.count(e.path().filename().string())) << e.path();
        else
            ADD_FAILURE() << e.path() << ": a file at the top of src/ belongs in its stage's folder";
    }
}

TEST(Layers, TestsMirrorTheStageFolders) {
    for (const auto& e : fs::directory_iterator(fs::path(DECKSCALE_SOURCE_DIR) / "tests")) {
        if (!e.is_directory()) continue;
        std::string name = e.path().filename().string();
        EXPECT_TRUE(name == "support" || name == "fuzz" || kLayers.count(name)) << e.path();
    }
}

// The checker itself, on small invented trees: each rule fires.
TEST(Layers, CheckerFindsEachKindOfViolation) {
    std::vector<SourceText> tree = {
        {"src/deck/card.hpp", "#pragma once\n#include \"base/big_buffer.hpp\"\n"},
        {"src/base/big_buffer.hpp", "#pragma once\n"},
        {"src/scale/rules.hpp", "#include \"deck/card.hpp\"\n#include \"grammar/g.hpp\"\n"},
        {"grammar/g.hpp", "#pragma once\n"},
        {"src/deck/load.cpp", "#include \"deck/card.hpp\"\n  #  include \"scale/rules.hpp\"\n"},
        {"src/sim/child.cpp", "#include <ngspice/sharedspice.h>\n#include \"card.hpp\"\n"},
        {"src/verify/x.cpp", "#include <ngspice/sharedspice.h>\n#include \"deck/missing.hpp\"\n"},
        {"src/extra/y.cpp", "\n"},
        {"src/loose.cpp", "\n"},
    };
    auto v = layer_violations(tree);
    std::vector<std::string> expected = {
        "src/scale/rules.hpp:2: scale/ may not include grammar/ (\"grammar/g.hpp\"): a back edge",
        "src/deck/load.cpp:2: deck/ may not include scale/ (\"scale/rules.hpp\"): a back edge",
        "src/sim/child.cpp:2: include \"card.hpp\" does not name its folder",
        "src/verify/x.cpp:1: only sim/ may include ngspice's headers",
        "src/verify/x.cpp:2: include \"deck/missing.hpp\" names no file of the tree",
        "src/extra/y.cpp: folder 'extra' is not in the layer map (add it to kLayers and DEVELOPERS.md)",
        "src/loose.cpp: not in a stage folder (src/<stage>/ or grammar/)",
    };
    EXPECT_EQ(joined(v), joined(expected));
}

}  // namespace
}  // namespace deckscale
