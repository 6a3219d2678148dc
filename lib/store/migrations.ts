import type Database from "better-sqlite3";
import { chainExistingAuditEntries } from "./auditChain";

/**
 * Numbered migrations, named by intent. Never edit an applied one: add a new one. `sql` runs first, then `run` (for a
 * step SQL alone cannot do), both in the migration's transaction.
 */
export const MIGRATIONS: { id: number; name: string; sql: string; run?: (db: Database.Database) => void }[] = [
  {
    id: 1,
    name: "create_uploads_tests_analyses_reports",
    sql: `
      create table uploads (
        id integer primary key,
        file_name text not null,
        sha256 text not null,
        size_bytes integer not null,
        bytes blob not null,
        created_at text not null
      );
      create table tests (
        id integer primary key,
        upload_id integer references uploads(id),
        label text not null,
        status text not null check (status in ('imported', 'refused')),
        record_json text,
        import_json text not null,
        demo integer not null default 0,
        created_at text not null
      );
      create table analyses (
        id integer primary key,
        test_id integer not null references tests(id),
        version integer not null,
        settings_json text not null,
        engine_version text not null,
        note text,
        created_by text,
        created_at text not null,
        unique (test_id, version)
      );
      create table reports (
        id integer primary key,
        test_id integer not null references tests(id),
        analysis_id integer not null references analyses(id),
        status text not null check (status in ('draft', 'signed')),
        draft_json text not null,
        signed_by text,
        signed_at text,
        created_at text not null
      );
      create table mapping_profiles (
        id integer primary key,
        name text not null unique,
        mapping_json text not null,
        created_at text not null
      );
      create table audit (
        id integer primary key,
        at text not null,
        actor text,
        action text not null,
        test_id integer,
        detail text
      );
    `,
  },
  {
    id: 2,
    name: "make_signed_reports_immutable",
    // A signed report never changes or disappears: a revision is a new draft row (lib/store/reports.ts).
    sql: `
      create trigger reports_signed_no_update before update on reports
      when old.status = 'signed'
      begin
        select raise(abort, 'a signed report is immutable; save a new draft version instead');
      end;
      create trigger reports_signed_no_delete before delete on reports
      when old.status = 'signed'
      begin
        select raise(abort, 'a signed report cannot be deleted');
      end;
      create index reports_by_test on reports (test_id, id);
    `,
  },
  {
    id: 3,
    name: "create_lab_settings",
    // One row: the lab's default choices (equations per quantity and ergometer, disputed cut-offs,
    // averaging), applied to every test until a reviewer saves a test-specific version.
    sql: `
      create table lab_settings (
        id integer primary key check (id = 1),
        settings_json text not null,
        updated_by text,
        updated_at text not null
      );
    `,
  },
  {
    id: 4,
    name: "pin_the_record_of_each_analysis_version",
    // An analysis version is its settings AND the record they were applied to: a signed report is rebuilt from the
    // record it was signed on, not from one corrected later (patient details, spirometry, a re-read file). Records are
    // kept once per content (sha256 of the record JSON); versions saved before this migration have none and fall back
    // to the test's current record. `revision` counts saves of a draft, so a save from a stale page is refused.
    sql: `
      create table record_snapshots (
        sha256 text primary key,
        record_json text not null
      );
      alter table analyses add column record_sha256 text references record_snapshots(sha256);
      alter table reports add column revision integer not null default 0;
    `,
  },
  {
    id: 5,
    name: "freeze_the_signed_report",
    // What was signed is kept as signed: the whole report (values, charts, text, sources) as JSON, written by the same
    // statement that signs, so a later engine, equation file or setting cannot change a signed report's page or PDF.
    // Versions signed before this migration have none and are rebuilt from their pinned record and settings.
    sql: `
      alter table reports add column signed_model_json text;
    `,
  },
  {
    id: 6,
    name: "accounts_and_sessions",
    // Optional log-in. With no enabled account the app stays open to whoever reaches it on this machine (the default
    // for one workstation); once an account exists every page, download and form asks for a session. Passwords are
    // kept only as scrypt hashes; sessions only as the SHA-256 of their random token.
    sql: `
      create table accounts (
        id integer primary key,
        username text not null unique,
        display_name text not null,
        role text not null check (role in ('clinician', 'physiologist')),
        password_hash text not null,
        disabled integer not null default 0,
        created_at text not null
      );
      create table sessions (
        token_sha256 text primary key,
        account_id integer not null references accounts(id),
        created_at text not null,
        expires_at text not null
      );
    `,
  },
  {
    id: 7,
    name: "append_only_audit",
    // The audit trail is written once and kept: the database itself refuses to change or delete an entry, as it does
    // for a signed report (a file copied elsewhere can still be edited with other tools; this guards the app's own use).
    sql: `
      create trigger audit_no_update before update on audit
      begin
        select raise(abort, 'the audit trail is append-only');
      end;
      create trigger audit_no_delete before delete on audit
      begin
        select raise(abort, 'the audit trail is append-only');
      end;
    `,
  },
  {
    id: 8,
    name: "session_idle_time",
    // A session also ends after a spell without use (`SESSION_IDLE_MINUTES`): the time of its last use is kept.
    sql: `
      alter table sessions add column last_seen_at text;
    `,
  },
  {
    id: 9,
    name: "audit_time_from_the_database_and_hash_chain",
    // Every audit entry carries `hash`, the SHA-256 over the previous entry's hash and its own fields (lib/store/auditChain.ts),
    // so an entry changed behind the app's back shows in `verifyAuditChain`. Entries already in the table are chained here,
    // in id order from the genesis value; the no-update trigger is lifted for that one pass and put back as it was.
    //
    // The time of an entry is the database's own clock. SQLite triggers cannot assign NEW.at, and a trigger that rewrote
    // the row after the insert would need a hole in the no-update trigger, so instead the insert trigger refuses an entry
    // whose time is not in the canonical form or differs from the database clock by more than 1 second. The app's insert
    // reads the clock in the same statement (`strftime(..., 'now')`, which SQLite keeps fixed within one statement: SQLite
    // documentation, date and time functions, recalled; so the difference is 0); the second's leeway (this product's
    // choice) only keeps the check from depending on that. A backdated or future-dated entry
    // is refused, and so is one without a hash. (A person who can drop triggers can drop this one too: docs say so.)
    sql: `
      alter table audit add column hash text;
      drop trigger audit_no_update;
    `,
    run: (db) => {
      chainExistingAuditEntries(db);
      db.exec(`
        create trigger audit_no_update before update on audit
        begin
          select raise(abort, 'the audit trail is append-only');
        end;
        create trigger audit_time_and_hash before insert on audit
        when new.at is null
          or new.at is not strftime('%Y-%m-%dT%H:%M:%fZ', new.at)
          or abs(julianday(new.at) - julianday('now')) * 86400.0 > 1.0
          or new.hash is null
          or length(new.hash) <> 64
        begin
          select raise(abort, 'an audit entry takes its time from the database clock and carries its chain hash');
        end;
        create index audit_by_test on audit (test_id, action, actor, at);
      `);
    },
  },
];
