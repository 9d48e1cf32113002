/**
 * Forward migrations of study.db. Migration N takes the schema from version N-1 to N; a study
 * opened by a newer trellis is migrated in one transaction, and an older trellis refuses a study
 * whose version it does not know.
 */
export const MIGRATIONS: string[] = [
  // 1: transcripts, passages with their stored analysis, template revisions, codings.
  `
  CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);

  CREATE TABLE transcripts (
    id        INTEGER PRIMARY KEY,
    name      TEXT NOT NULL UNIQUE,
    file      TEXT NOT NULL,
    format    TEXT NOT NULL,
    hash      TEXT NOT NULL,
    source    TEXT NOT NULL,
    labelled  INTEGER NOT NULL,
    added_at  TEXT NOT NULL
  );

  CREATE TABLE passages (
    id            TEXT PRIMARY KEY,
    transcript_id INTEGER NOT NULL REFERENCES transcripts(id) ON DELETE CASCADE,
    ordinal       INTEGER NOT NULL,
    turn          INTEGER NOT NULL,
    speaker       TEXT,
    role          TEXT NOT NULL CHECK (role IN ('interviewer', 'participant')),
    question      TEXT,
    start_s       REAL,
    end_s         REAL,
    char_offset   INTEGER NOT NULL,
    char_length   INTEGER NOT NULL,
    text          TEXT NOT NULL,
    words         INTEGER NOT NULL,
    lemmas        TEXT NOT NULL,  -- space-joined lower-case lemmas of the word tokens
    stops         BLOB NOT NULL,  -- one byte a token: 1 = stop word
    spans         BLOB NOT NULL,  -- Int32 pairs: token start, end in text
    UNIQUE (transcript_id, ordinal)
  );

  CREATE TABLE revisions (
    rev        INTEGER PRIMARY KEY,
    created_at TEXT NOT NULL,
    author     TEXT NOT NULL,
    action     TEXT NOT NULL,  -- 'set FILE', 'rename', 'move', ...
    reason     TEXT,
    outline    TEXT NOT NULL,  -- the outline text of this revision
    tree       TEXT NOT NULL,  -- JSON Template with theme ids
    changes    TEXT NOT NULL   -- JSON Change[] against the previous revision
  );

  -- Every theme that was ever in the template; retired ones keep their history.
  CREATE TABLE themes (
    id          TEXT PRIMARY KEY,
    name        TEXT NOT NULL,
    created_rev INTEGER NOT NULL REFERENCES revisions(rev),
    retired_rev INTEGER REFERENCES revisions(rev),
    merged_into TEXT REFERENCES themes(id)
  );

  CREATE TABLE codings (
    id          INTEGER PRIMARY KEY,
    passage_id  TEXT NOT NULL REFERENCES passages(id) ON DELETE CASCADE,
    theme_id    TEXT NOT NULL REFERENCES themes(id),
    coder       TEXT NOT NULL,
    origin      TEXT NOT NULL,  -- 'sheet', 'inline', later 'accepted', 're-coded'
    created_at  TEXT NOT NULL,
    rev         INTEGER NOT NULL,
    first_theme TEXT REFERENCES themes(id),  -- the theme first given, when a merge re-pointed it
    removed_at  TEXT,
    removed_by  TEXT
  );
  CREATE UNIQUE INDEX codings_current ON codings (passage_id, theme_id, coder) WHERE removed_at IS NULL;
  CREATE INDEX codings_theme ON codings (theme_id);
  CREATE INDEX passages_transcript ON passages (transcript_id, ordinal);
  `,
  // 2: suggestion runs and their ranked candidates.
  `
  CREATE TABLE suggestion_runs (
    id          INTEGER PRIMARY KEY,
    created_at  TEXT NOT NULL,
    rev         INTEGER NOT NULL REFERENCES revisions(rev),
    fingerprint TEXT NOT NULL,  -- hash of the fitted model state: same study, same fingerprint
    options     TEXT NOT NULL,  -- JSON: target precision and model options
    passages    INTEGER NOT NULL,
    unclaimed   INTEGER NOT NULL
  );

  -- No foreign keys here: a run writes hundreds of thousands of rows, and checking each costs
  -- twice the insert; the rows are made from the study's own passages and themes.
  CREATE TABLE suggestions (
    id          INTEGER PRIMARY KEY,
    run_id      INTEGER NOT NULL,
    passage_id  TEXT NOT NULL,
    theme_id    TEXT NOT NULL,
    rank        INTEGER NOT NULL,  -- 1 = best
    confidence  REAL NOT NULL,
    above       INTEGER NOT NULL,  -- above the theme's threshold
    chosen      INTEGER NOT NULL,  -- kept after the hierarchy rule
    reasons     TEXT NOT NULL      -- JSON Reason[]
  );
  CREATE INDEX suggestions_passage ON suggestions (passage_id);
  `,
  // 3: the decision log (append-only), codings made by decisions, and who looked at what.
  `
  CREATE TABLE decisions (
    id            INTEGER PRIMARY KEY,
    at            TEXT NOT NULL,
    coder         TEXT NOT NULL,
    action        TEXT NOT NULL CHECK (action IN ('accept', 'reject', 'recode', 'defer', 'undo', 'promote', 'dismiss')),
    suggestion_id INTEGER,  -- no foreign key: the entry keeps its own copy of what was suggested
    passage_id    TEXT,
    transcript    TEXT,
    theme_id      TEXT,   -- the theme suggested
    confidence    REAL,
    rank          INTEGER,
    chosen_theme  TEXT,   -- the theme coded: the suggested one (accept) or another (recode)
    note          TEXT,
    rev           INTEGER,
    fingerprint   TEXT,
    bulk          INTEGER NOT NULL DEFAULT 0,
    undoes        INTEGER REFERENCES decisions(id),
    cluster_id    INTEGER  -- promote and dismiss act on a cluster of unclaimed passages
  );
  CREATE INDEX decisions_passage ON decisions (passage_id);
  CREATE INDEX decisions_suggestion ON decisions (suggestion_id);
  CREATE TRIGGER decisions_append_only_update BEFORE UPDATE ON decisions
    BEGIN SELECT RAISE(ABORT, 'the decision log is append-only'); END;
  CREATE TRIGGER decisions_append_only_delete BEFORE DELETE ON decisions
    BEGIN SELECT RAISE(ABORT, 'the decision log is append-only'); END;

  ALTER TABLE codings ADD COLUMN decision_id INTEGER REFERENCES decisions(id);

  -- A coder looked at this passage (a sheet row, a decision): for agreement, "not coded" is
  -- then a judgement, not a gap.
  CREATE TABLE seen (
    coder      TEXT NOT NULL,
    passage_id TEXT NOT NULL,
    PRIMARY KEY (coder, passage_id)
  ) WITHOUT ROWID;
  `,
  // 4: discovery: clusters of unclaimed passages, and what the researcher made of them.
  `
  CREATE TABLE discovery_runs (
    id          INTEGER PRIMARY KEY,
    created_at  TEXT NOT NULL,
    rev         INTEGER NOT NULL,
    fingerprint TEXT NOT NULL,     -- the suggestion model the pool was judged by
    pool        INTEGER NOT NULL,  -- unclaimed passages clustered
    k           INTEGER NOT NULL,
    silhouettes TEXT NOT NULL,     -- JSON [{k, silhouette}]
    options     TEXT NOT NULL
  );
  CREATE TABLE clusters (
    id          INTEGER PRIMARY KEY,
    run_id      INTEGER NOT NULL REFERENCES discovery_runs(id),
    label       TEXT NOT NULL,     -- C1, C2, ... within the run, largest first
    size        INTEGER NOT NULL,
    cohesion    REAL NOT NULL,
    detail      TEXT NOT NULL,     -- JSON: terms, central passages, transcripts, speakers
    status      TEXT NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'promoted', 'dismissed')),
    theme_id    TEXT               -- the theme it was promoted into
  );
  CREATE TABLE cluster_passages (
    cluster_id  INTEGER NOT NULL REFERENCES clusters(id),
    passage_id  TEXT NOT NULL,
    similarity  REAL NOT NULL,     -- cosine to the cluster centre
    PRIMARY KEY (cluster_id, passage_id)
  ) WITHOUT ROWID;
  `,
  // 5: a coder can mark a passage "reviewed, nothing to code" ('nocode'), logged like a decision.
  // SQLite cannot change a CHECK in place: the table is rebuilt (foreign keys are off while
  // migrations run; see migrate in db.ts), with its indexes and append-only triggers.
  `
  CREATE TABLE decisions_v5 (
    id            INTEGER PRIMARY KEY,
    at            TEXT NOT NULL,
    coder         TEXT NOT NULL,
    action        TEXT NOT NULL CHECK (action IN ('accept', 'reject', 'recode', 'defer', 'undo', 'promote', 'dismiss', 'nocode')),
    suggestion_id INTEGER,
    passage_id    TEXT,
    transcript    TEXT,
    theme_id      TEXT,
    confidence    REAL,
    rank          INTEGER,
    chosen_theme  TEXT,
    note          TEXT,
    rev           INTEGER,
    fingerprint   TEXT,
    bulk          INTEGER NOT NULL DEFAULT 0,
    undoes        INTEGER REFERENCES decisions(id),
    cluster_id    TEXT  -- the cluster's stable id, as printed (entries before schema 7: its row number)
  );
  INSERT INTO decisions_v5 SELECT id, at, coder, action, suggestion_id, passage_id, transcript, theme_id, confidence, rank,
    chosen_theme, note, rev, fingerprint, bulk, undoes, cluster_id FROM decisions;
  DROP TABLE decisions;
  ALTER TABLE decisions_v5 RENAME TO decisions;
  CREATE INDEX decisions_passage ON decisions (passage_id);
  CREATE INDEX decisions_suggestion ON decisions (suggestion_id);
  CREATE TRIGGER decisions_append_only_update BEFORE UPDATE ON decisions
    BEGIN SELECT RAISE(ABORT, 'the decision log is append-only'); END;
  CREATE TRIGGER decisions_append_only_delete BEFORE DELETE ON decisions
    BEGIN SELECT RAISE(ABORT, 'the decision log is append-only'); END;
  `,
  // 6: memos: dated, attributed notes on a theme, a transcript, a passage or the study. Kept like
  // the decision log: a memo is added, never rewritten (a later memo can revise an earlier one).
  `
  CREATE TABLE memos (
    id          INTEGER PRIMARY KEY,
    at          TEXT NOT NULL,
    author      TEXT NOT NULL,
    target_kind TEXT NOT NULL CHECK (target_kind IN ('study', 'theme', 'transcript', 'passage')),
    target      TEXT,              -- theme id, transcript name or passage id; NULL for the study
    text        TEXT NOT NULL,
    rev         INTEGER            -- the template revision current when it was written
  );
  CREATE INDEX memos_target ON memos (target_kind, target);
  CREATE TRIGGER memos_append_only_update BEFORE UPDATE ON memos
    BEGIN SELECT RAISE(ABORT, 'memos are kept as written: add a new memo instead'); END;
  CREATE TRIGGER memos_append_only_delete BEFORE DELETE ON memos
    BEGIN SELECT RAISE(ABORT, 'memos are kept as written: add a new memo instead'); END;
  `,
  // 7: a cluster's stable id, the same in every run that finds the same members (src/discover/key.ts).
  // Clusters of older runs have none; the next "trellis discover" gives its clusters theirs.
  `
  ALTER TABLE clusters ADD COLUMN key TEXT;
  CREATE INDEX clusters_key ON clusters (key);
  `,
  // 8: the researcher's choice of quotes: a passage pinned to a theme's quotes, or dropped from
  // them (trellis quote pin|drop). One choice per theme and passage; the report and codebook honour it.
  `
  CREATE TABLE quote_choices (
    id          INTEGER PRIMARY KEY,
    theme_id    TEXT NOT NULL,
    passage_id  TEXT NOT NULL,
    choice      TEXT NOT NULL CHECK (choice IN ('pin', 'drop')),
    at          TEXT NOT NULL,
    coder       TEXT NOT NULL,
    UNIQUE (theme_id, passage_id)
  );
  `,
  // 9: pseudonyms: an alias for a speaker label or a transcript name, used by --pseudonymise.
  `
  CREATE TABLE aliases (
    kind   TEXT NOT NULL CHECK (kind IN ('speaker', 'transcript')),
    name   TEXT NOT NULL,   -- the speaker label or transcript name as stored
    alias  TEXT NOT NULL,
    at     TEXT NOT NULL,
    PRIMARY KEY (kind, name)
  );
  CREATE UNIQUE INDEX aliases_alias ON aliases (kind, alias);
  `,
  // 10: codings that "add --replace" could not place in the edited transcript, kept (not dropped)
  // with what they were, so the team can re-code them.
  `
  CREATE TABLE unplaced_codings (
    id          INTEGER PRIMARY KEY,
    transcript  TEXT NOT NULL,
    passage_id  TEXT NOT NULL,   -- the old passage, gone with the old version
    text        TEXT NOT NULL,   -- its text, as it was coded
    theme_id    TEXT NOT NULL REFERENCES themes(id),
    coder       TEXT NOT NULL,
    origin      TEXT NOT NULL,
    coded_at    TEXT NOT NULL,
    unplaced_at TEXT NOT NULL
  );
  `,
  // 11: one definition of "the decision still stands": not an undo entry, and not undone since.
  `
  CREATE VIEW standing_decisions AS
    SELECT d.* FROM decisions d
    WHERE d.action != 'undo' AND NOT EXISTS (SELECT 1 FROM decisions u WHERE u.undoes = d.id);
  `,
  // 12: the suggestion model's learned state, kept so that later commands on the same inputs
  // (review, discover, triage, profile, the next suggest) score from it instead of fitting again.
  `
  CREATE TABLE model_states (
    inputs      TEXT PRIMARY KEY,   -- hash of all the fit learned from: passages, codings, rejections, template, options
    fingerprint TEXT NOT NULL,
    state       BLOB NOT NULL,      -- the state as JSON, gzip-compressed
    created_at  TEXT NOT NULL,
    used_at     TEXT NOT NULL
  );
  ALTER TABLE suggestion_runs ADD COLUMN model_inputs TEXT;   -- the model_states row the run scored with
  `,
];

export const SCHEMA_VERSION = MIGRATIONS.length;
