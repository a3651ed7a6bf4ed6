#include "scale/terminals.hpp"

#include "base/text_util.hpp"

namespace deckscale {
namespace {

bool plain_word(const Card& c, std::size_t i) {
    return i < c.fields.size() && c.fields[i].kind == TokenKind::word &&
           !(i + 1 < c.fields.size() && c.fields[i + 1].kind == TokenKind::equals);
}

void nodes(ElementLinks& l, std::size_t first, std::size_t last) {
    for (std::size_t i = first; i <= last; ++i) l.current_nodes.push_back(i);
}

// The first plain word from field `from` on that is a model name.
std::optional<std::size_t> first_model(const Card& c, std::size_t from,
                                       const std::function<bool(const std::string&)>& is_model) {
    for (std::size_t i = from; i < c.fields.size(); ++i)
        if (plain_word(c, i) && is_model(to_lower(c.field_text(i)))) return i;
    return std::nullopt;
}

// An X line: Xname nodes... subckt [params:] [name=value ...]. The subcircuit is the last
// plain word before the parameters.
std::optional<std::size_t> subckt_field(const Card& c) {
    std::optional<std::size_t> last;
    for (std::size_t i = 1; i < c.fields.size(); ++i) {
        if (c.fields[i].kind != TokenKind::word) break;
        if (iequals(c.field_text(i), "params:")) break;
        if (i + 1 < c.fields.size() && c.fields[i + 1].kind == TokenKind::equals) break;
        last = i;
    }
    return last;
}

}  // namespace

bool is_ground(const std::string& node) { return node == "0" || node == "gnd"; }

ElementLinks element_links(const Card& c, const std::function<bool(const std::string&)>& is_model) {
    ElementLinks l;
    if (c.fields.empty()) return l;
    char letter = ascii_lower(c.field_text(0)[0]);
    std::size_t n = c.fields.size();
    auto two = [&] {
        if (n > 2) nodes(l, 1, 2);
    };
    switch (letter) {
        case 'r':
        case 'c':
        case 'l':
            two();
            l.model = first_model(c, 3, is_model);
            break;
        case 'i':
        case 'f':
        case 'g':
        case 'h':
        case 'b':
            two();
            break;
        case 'd':
            two();
            if (plain_word(c, 3)) l.model = 3;
            break;
        case 'q':
        case 'm': {
            // c b e [s] model; d g s [b, more for SOI] model (a VDMOS has three nodes): the
            // first model name after them; without one known, the model's usual field if it
            // holds a plain word (not an '=' or the value of a key, as in 'q(] area=1').
            auto known = first_model(c, 4, is_model);
            std::size_t at = known.value_or(letter == 'q' ? 4 : 5);
            if (known || plain_word(c, at)) l.model = at;
            nodes(l, 1, std::min(at, n) - 1);
            break;
        }
        case 'j':
        case 'z':
        case 'u':
        case 'w':  // three nodes (W: two and a source), model
            if (plain_word(c, 4)) l.model = 4;
            if (letter == 'w')
                two();
            else if (n > 3)
                nodes(l, 1, 3);
            break;
        case 'o':
        case 's':  // four nodes (S: two and two controlling ones), model
            if (plain_word(c, 5)) l.model = 5;
            if (letter == 's')
                two();
            else if (n > 4)
                nodes(l, 1, 4);
            break;
        case 't':
            if (n > 4) nodes(l, 1, 4);
            break;
        case 'x':
            l.subckt = subckt_field(c);
            if (l.subckt) nodes(l, 1, *l.subckt - 1);
            break;
        case 'a':
            for (std::size_t i = n; i-- > 1;)
                if (plain_word(c, i)) {
                    if (is_model(to_lower(c.field_text(i)))) l.model = i;
                    break;
                }
            break;
        default:
            break;  // V and E (ideal), K, and the types the reader warns about
    }
    // Only plain words are nodes (a field such as "(" in "PULSE(" never is).
    std::erase_if(l.current_nodes, [&](std::size_t i) { return !plain_word(c, i); });
    return l;
}

}  // namespace deckscale
