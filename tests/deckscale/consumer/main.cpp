// consumer DECK OUT: scales DECK to 50 Ohm / 10 MHz into OUT and verifies the pair; prints the
// verification report (the verify command's text) and exits 0 when it passed.
#include <deckscale/scale.hpp>
#include <deckscale/verify.hpp>
#include <iostream>

int main(int argc, char** argv) {
    if (argc != 3) return 2;
    try {
        deckscale::api::ScaleOptions o;
        o.km = 50;
        o.kf = deckscale::api::parse_factor("2*pi*10meg");
        o.output = argv[2];
        deckscale::api::Deck deck = deckscale::api::read_deck(argv[1]);
        deckscale::api::write(deckscale::api::scale(deck, o));
        deckscale::api::VerifyOptions v;
        v.km = o.km;
        v.kf = o.kf;
        auto r = deckscale::api::verify(deck, deckscale::api::read_deck(argv[2]), v);
        std::cout << r.text;
        return r.passed ? 0 : 1;
    } catch (const deckscale::DeckError& e) {
        std::cerr << deckscale::render(e.diagnostic());
        return 2;
    }
}
