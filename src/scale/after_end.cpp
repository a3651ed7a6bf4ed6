#include "scale/after_end.hpp"

#include <string_view>

namespace deckscale {

void check_after_end(ScalePass& p) {
    const Card& c = p.card();
    for (const Token& t : c.tokens) {
        if (t.kind != TokenKind::after_end) continue;
        std::string_view text = c.text(t);
        std::size_t line = 0;
        while (line < text.size()) {
            std::size_t next = text.find('\n', line);
            if (next == std::string_view::npos) next = text.size();
            std::size_t first = text.find_first_not_of(" \t\r", line);
            if (first < next) {
                std::string_view rest = text.substr(first, next - first);
                bool comment =
                    rest[0] == '*' || rest[0] == ';' || rest[0] == '$' || rest.substr(0, 2) == "//";
                if (!comment) {
                    std::size_t end = next;
                    while (end > first &&
                           (text[end - 1] == '\r' || text[end - 1] == ' ' || text[end - 1] == '\t'))
                        --end;
                    Token at{TokenKind::after_end, static_cast<std::uint32_t>(t.begin + first),
                             static_cast<std::uint32_t>(t.begin + end)};
                    p.unscalable(at,
                                 "card after .end: the ngspice 39 program reads it as part of "
                                 "the circuit, and it would stay unscaled; move it before "
                                 ".end or delete it");
                    return;
                }
            }
            line = next + 1;
        }
    }
}

}  // namespace deckscale
