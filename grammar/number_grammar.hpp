// PEGTL grammar of a number as ngspice 39 reads it on element and dot cards (manual
// 2.1.4.2-2.1.4.3; shared notes "deck-syntax.md" §2). Rules only, no actions.
//
//   [sign] mantissa [exponent] [scale suffix] [unit letters]
//   12  -44  3.14  .5  5.  1e-14  2.65E3  1d3  10uF  2.2MEG  1kOhm  159mHz
//
// The scale suffixes are T G MEG K M(milli) MIL U N P F, case-insensitive; there is no
// atto suffix in ngspice 39. Letters after the suffix (the unit tail) are ignored by
// ngspice; anything else after the number (digits, dots, '_', non-ASCII) is refused here,
// because ngspice 39 would silently drop it (1.2.3 reads as 1.2, 1k5 as 1000).
#pragma once

#include <tao/pegtl.hpp>

namespace deckscale::grammar::number {

namespace pg = tao::pegtl;

struct sign : pg::one<'+', '-'> {};
struct digits : pg::plus<pg::digit> {};
struct mantissa
    : pg::sor<pg::seq<digits, pg::opt<pg::one<'.'>, pg::star<pg::digit>>>, pg::seq<pg::one<'.'>, digits>> {};
// 'd'/'D' is accepted as a Fortran-style exponent letter on element lines.
struct exponent : pg::seq<pg::one<'e', 'E', 'd', 'D'>, pg::opt<sign>, digits> {};
struct suffix : pg::sor<pg::istring<'m', 'e', 'g'>, pg::istring<'m', 'i', 'l'>,
                        pg::one<'t', 'T', 'g', 'G', 'k', 'K', 'm', 'M', 'u', 'U', 'n', 'N', 'p', 'P',
                                'f', 'F'>> {};
struct unit_tail : pg::star<pg::alpha> {};
struct value : pg::seq<pg::opt<sign>, mantissa, pg::opt<exponent>> {};
struct spice_number : pg::seq<value, pg::opt<suffix>, unit_tail, pg::eof> {};

// A leading part that looks like a number at all (used to tell "bad number" from "name").
struct number_start : pg::seq<pg::opt<sign>, pg::sor<pg::digit, pg::seq<pg::one<'.'>, pg::digit>>> {};

}  // namespace deckscale::grammar::number
