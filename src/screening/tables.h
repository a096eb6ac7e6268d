// The review tables of a sift in the index file (docs/index-format.md,
// "Review tables"): created on first write, never touching the index's own.
#pragma once

namespace lode::screening {

// Every statement is idempotent: run on each writable open.
inline constexpr const char* kSiftSchema = R"sql(
CREATE TABLE IF NOT EXISTS sift (
  id         INTEGER PRIMARY KEY,
  name       TEXT NOT NULL UNIQUE,
  query      TEXT NOT NULL,
  created_ns INTEGER NOT NULL,
  created_by TEXT NOT NULL,
  options    TEXT NOT NULL
);
CREATE TABLE IF NOT EXISTS sift_batch (
  sift       INTEGER NOT NULL REFERENCES sift(id),
  number     INTEGER NOT NULL,
  is_check   INTEGER NOT NULL,
  time_ns    INTEGER NOT NULL,
  model      TEXT NOT NULL,
  trained_on INTEGER NOT NULL,
  found_then INTEGER NOT NULL,
  remainder  INTEGER NOT NULL,
  PRIMARY KEY (sift, number)
);
CREATE TABLE IF NOT EXISTS sift_proposal (
  sift     INTEGER NOT NULL,
  batch    INTEGER NOT NULL,
  position INTEGER NOT NULL,
  doc      TEXT NOT NULL,
  score    REAL NOT NULL,
  PRIMARY KEY (sift, batch, position)
);
CREATE TABLE IF NOT EXISTS sift_judgment (
  seq      INTEGER PRIMARY KEY,
  sift     INTEGER NOT NULL,
  doc      TEXT NOT NULL,
  content  TEXT NOT NULL,
  relevant INTEGER NOT NULL,
  reviewer TEXT NOT NULL,
  time_ns  INTEGER NOT NULL,
  batch    INTEGER NOT NULL
);
CREATE INDEX IF NOT EXISTS sift_judgment_by_sift ON sift_judgment (sift, seq);
)sql";

}  // namespace lode::screening
