// lode/matrix.h — the document-term matrix, exported for other tools.
//
// Three files:
//  * the matrix in Matrix Market coordinate format ("%%MatrixMarket matrix
//    coordinate real general"; NIST, Boisvert, Pozo & Remington, "The Matrix
//    Market Exchange Formats", 1996): comment lines (%) naming the settings,
//    then "rows columns entries", then one "row column value" line per
//    non-zero entry, 1-based, rows ascending and columns ascending within a row;
//    values in the shortest form that reads back to the same double;
//  * the vocabulary: line j is the term of column j;
//  * the documents: line i is the id of row i's document (as search prints it;
//    a backslash, tab, newline or carriage return in an id is written \\ \t \n \r).
// Rows are the live documents in id order (a document without terms is an
// empty row). Columns are the terms of the chosen fields that pass the
// filters, in byte order of the term; when both fields are chosen a word's
// title and body counts are added into one column. df and N are counted over
// the exported rows (equal to the index's df for one field).
//
// Weight of an entry = tf(tf) x idf(df), then the row is l2-normalised over the
// kept columns if asked. tf and idf are ranking.h's SMART letters (smart_tf /
// smart_idf), so any textbook table or scikit-learn setting can be matched:
//   tf  n count | r count/length | l 1 + log tf | b binary | a, L as in ranking.h
//   idf n none  | t log(N/df)    | s log((1+N)/(1+df)) + 1 | p as in ranking.h
// scikit-learn TfidfVectorizer defaults = tf n, idf s, log base e, l2.
// "length" is the document's index-term count in the chosen fields.
//
// Files are written under a temporary name and renamed when complete.
//
// Thread safety: export_matrix opens its own read scope on `reader`, which
// must have none active; one thread at a time per reader.
#pragma once

#include <array>
#include <cstdint>
#include <functional>
#include <string>

#include "lode/index.h"
#include "lode/status.h"

namespace lode {

struct MatrixOptions {
  char tf = 'n';                 // raw count: what most downstream tools expect
  char idf = 't';                // log(N/df)
  double log_base = 10.0;        // of tf and idf logs (e for scikit-learn)
  bool l2 = true;                // normalise each row to unit length
  std::array<bool, kFieldCount> fields = {false, true};  // body only by default
  std::uint64_t min_df = 1;      // drop terms in fewer documents
  double max_df = 1.0;           // drop terms in a larger share of documents (0, 1]
  std::size_t max_terms = 0;     // keep only this many terms of highest df (0 = all; ties by term)
  // Called with (documents done, total) during each of the two passes.
  std::function<void(std::size_t, std::size_t)> progress;
  Status check() const;          // InvalidArgument naming the bad option
};

struct MatrixFiles {
  std::string matrix;            // e.g. "out.mtx"
  std::string vocabulary;        // e.g. "out.terms"
  std::string documents;         // e.g. "out.docs"
};

struct MatrixSummary {
  std::size_t rows = 0, columns = 0, entries = 0;
};

// Writes the three files. InvalidArgument for bad options; IOError naming
// the file that could not be written; index read errors. On error no file is
// left half-written (temporaries are removed).
Result<MatrixSummary> export_matrix(IndexReader& reader, const MatrixOptions& options, const MatrixFiles& files);

}  // namespace lode
