// lode/verify.h — reading a whole index to find damage before a query does.
//
// A damaged index (a disk fault, a file copied while a writer ran, bytes
// flipped by hand) can open and answer `lode stats` and still fail a query
// later, naming a term or a block the user knows nothing about. verify_index()
// reads every table once, in one snapshot, and reports each thing that does
// not hold: SQLite's own page checks (PRAGMA integrity_check) and lode's
// invariants (docs/index-format.md):
//   - the meta counters equal what the tables hold (live and dead documents,
//     field lengths, files, terms with df > 0, live postings);
//   - every postings segment and block decodes and its documents were assigned;
//   - each term's df and cf equal its live postings, and equal what the
//     forward index of the live documents says;
//   - every posting's positions decode, every segment's positions add up;
//   - every live document has its forward index (naming existing terms of its
//     field, tfs adding up to its field lengths), norms, text and metadata.
// The decoders are the ones queries use (PostingList, codec::), so what
// passes here decodes there.
//
// Thread safety: a free function; it opens its own connection and writes
// nothing. It may run while a writer commits (it sees one snapshot).
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "lode/status.h"

namespace lode {

struct VerifyOptions {
  // Findings listed in full; later ones are only counted. Default 50: damage
  // usually repeats (one bad page breaks many rows), and the first few name
  // where it is.
  std::size_t max_findings = 50;
};

struct VerifyReport {
  std::vector<std::string> findings;  // each names the table, row or term at fault
  std::uint64_t unlisted = 0;         // findings past VerifyOptions::max_findings
  // What was read.
  std::uint64_t documents = 0;  // rows of docs
  std::uint64_t terms = 0;      // rows of terms
  std::uint64_t segments = 0;   // postings rows
  std::uint64_t postings = 0;   // postings decoded, live and dead
  bool ok() const { return findings.empty() && unlisted == 0; }
};

// Reads the index at `path` and reports what is wrong with it (an empty
// report: nothing). Damage, including a file SQLite cannot read as a
// database, is a finding, not an error. Errors: NotFound (no file at path),
// IOError (the file cannot be opened at all). Memory: a few bytes per
// document and per term of the index.
Result<VerifyReport> verify_index(const std::string& path, const VerifyOptions& options = {});

}  // namespace lode
