// bench/morphology.h — invented English-looking words and their inflections.
//
// Words are built from onset + vowel + coda syllables; inflection follows the
// ordinary English spelling rules (plural -es after sibilants, consonant + y
// -> ies/ied, silent e dropped before -ing/-ed, the final consonant of a short
// closed syllable doubled: "stop" -> "stopping"), so a stemmer meets the same
// cases it meets in real prose.
//
// Thread safety: free functions without state.
#pragma once

#include <string>

#include "rng.h"

namespace lode::bench {

// A lemma of 1-4 syllables, sometimes with a derivational ending (-tion,
// -ment, -ness, -ity, -al, -ous, -ive, -ful, -able...). With probability
// `accented_share` one vowel becomes an accented one (UTF-8, e.g. "é").
std::string invent_lemma(Rng& rng, double accented_share);

std::string plural(const std::string& noun);        // "box" -> "boxes", "city" -> "cities"
std::string third_person(const std::string& verb);  // same rules as plural
std::string past(const std::string& verb);          // "stop" -> "stopped", "bake" -> "baked"
std::string gerund(const std::string& verb);        // "bake" -> "baking", "tie" -> "tying"
std::string comparative(const std::string& adj);    // "big" -> "bigger", "dry" -> "drier"
std::string superlative(const std::string& adj);    // "big" -> "biggest"
std::string adverb(const std::string& adj);         // "happy" -> "happily", "simple" -> "simply"

}  // namespace lode::bench
