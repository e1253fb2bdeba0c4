// Reads common misspellings of the words that carry a dosage's meaning ("tiwce",
// "dialy", "tablest") as the words meant, before the items are recognised. Private to
// src/dose. It corrects only words it does not know, and only into a short list of words.
#pragma once

#include <string>
#include <vector>

#include "dose/dosage_lexer.h"

namespace medload {

// Replaces, in place, each word token that no dosage phrase, unit or number uses and that
// is one edit (a swap of two neighbouring letters, one letter missing or one extra; a
// changed letter only in words of seven letters or more) from a listed word of five
// letters or more. Returns one note per correction ("read \"tiwce\" as \"twice\""). Pure.
std::vector<std::string> CorrectDosageTypos(std::vector<Token>& tokens);

}  // namespace medload
