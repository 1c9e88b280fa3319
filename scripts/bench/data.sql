-- Benchmark demo data for `npm run bench` (scripts/bench/data.ts runs this once per size on a copy of
-- the demo database, with :n replaced by the number of permits). Set-based: every table is filled by
-- one INSERT … SELECT over generate_series, cloning the demo story's rows (content, assessments,
-- signatures) so pages render what real ones do. Invented data for the fictional Aldermere Institute.
--
-- Proportions (common practice for a university safety office, not from a published survey):
--   departments  n/2 500 (at least 4)          people       n/20 (at least 60)
--   apparatus    n/10                          applications 1.3·n: n approved (one permit each),
--   drafts 8 %, submitted 5 %, in review 5 %, returned 3 %, rejected 4 %, withdrawn 5 % of n
--   revisions    one per submitted application, a second for a fifth of the approved ones
--   decisions    tier 1: approve; tier 2+: recommend then approve (as the default chain)
--   permits      issued over the last three years, 30–365 days long, 3 % revoked
-- Tiers: 30 % tier 0, 30 % tier 1, 20 % tier 2, 15 % tier 3, 5 % tier 4.

-- Rows are consistent by construction: skip the per-row foreign-key triggers (superuser only) and
-- the wait for the WAL flush, which together take most of the time.
SET LOCAL session_replication_role = replica;
SET LOCAL synchronous_commit = off;

CREATE TEMP TABLE gen_tier ON COMMIT DROP AS
SELECT i, CASE WHEN i % 20 < 6 THEN 0 WHEN i % 20 < 12 THEN 1 WHEN i % 20 < 16 THEN 2 WHEN i % 20 < 19 THEN 3 ELSE 4 END AS tier
FROM generate_series(0, 19) i;

INSERT INTO department (name, code)
SELECT 'Bench Department ' || d, 'BD' || d FROM generate_series(1, greatest(4, :n / 2500)) d;

CREATE TEMP TABLE gen_dept ON COMMIT DROP AS
SELECT id, row_number() OVER (ORDER BY code) - 1 AS k FROM department WHERE code LIKE 'BD%';

-- People: every 25th a reviewer, every 400th a safety officer, the rest instructors; they share the
-- demo password hash (nobody signs in as them; hashing thousands would take minutes).
INSERT INTO app_user (email, name, roles, department_id, password_hash)
SELECT 'person' || u || '@aldermere.test',
       (ARRAY['Imogen','Owen','Rafael','Dana','Sam','Priya','Tomasz','Nia','Leif','Maren','Odile','Kwame',
              'Ines','Farid','Greta','Hal','Yuki','Bram','Cleo','Ravi'])[1 + u % 20] || ' ' ||
       (ARRAY['Tallis','Pryce','Quenby','Whitlock','Ferreira','Ashdown','Belmont','Corrin','Dunmore',
              'Elsworth','Fenwick','Garland','Hollis','Ivers','Jessop','Kettering','Larkin','Merriot',
              'Norcott','Osgood','Penhale','Radley','Sallow','Thorne','Upcott'])[1 + (u / 20) % 25],
       CASE WHEN u % 400 = 0 THEN '{safety_officer}'::role[] WHEN u % 25 = 0 THEN '{reviewer}'::role[]
            ELSE '{instructor}'::role[] END,
       (SELECT id FROM gen_dept WHERE k = u % (SELECT count(*) FROM gen_dept)),
       (SELECT password_hash FROM app_user WHERE email = 'instructor@benchclear.test')
FROM generate_series(1, greatest(60, :n / 20)) u;

CREATE TEMP TABLE gen_user ON COMMIT DROP AS
SELECT id, department_id, row_number() OVER (ORDER BY email) - 1 AS k, roles
FROM app_user WHERE email LIKE 'person%@aldermere.test';
CREATE INDEX ON gen_user (k);
ANALYZE gen_user;
CREATE TEMP TABLE gen_reviewer ON COMMIT DROP AS
SELECT department_id, min(id::text)::uuid AS id FROM gen_user WHERE roles = '{reviewer}' GROUP BY department_id;

-- The demo story's newest revision of each tier is the pattern every generated revision clones.
CREATE TEMP TABLE gen_pattern ON COMMIT DROP AS
SELECT DISTINCT ON (r.tier) r.tier, r.content, r.assessment, a.apparatus_id, a.apparatus_revision_id
FROM application_revision r JOIN application a ON a.id = r.application_id
ORDER BY r.tier, r.submitted_at DESC;

INSERT INTO apparatus (name, room, department_id, owner_id, notes, tier, energy_j, created_at)
SELECT p.content -> 'apparatus' ->> 'name' || ' no. ' || x, 'Room ' || (100 + x % 300),
       gu.department_id, gu.id, p.content -> 'apparatus' ->> 'notes', p.tier,
       coalesce((p.assessment ->> 'totalEnergy_J')::double precision, 0), now() - (x % 1000) * interval '1 day'
FROM generate_series(1, greatest(10, :n / 10)) x
JOIN gen_tier t ON t.i = x % 20
JOIN gen_pattern p ON p.tier = t.tier
JOIN gen_user gu ON gu.k = x % (SELECT count(*) FROM gen_user);

INSERT INTO apparatus_revision (apparatus_id, revision, name, room, notes, setup, assessment, tier, created_by_id)
SELECT ap.id, 1, ap.name, ap.room, ap.notes, r.setup, r.assessment, ap.tier, ap.owner_id
FROM apparatus ap
JOIN LATERAL (SELECT setup, assessment FROM apparatus_revision WHERE tier = ap.tier ORDER BY created_at LIMIT 1) r ON true
WHERE ap.name LIKE '% no. %';

CREATE TEMP TABLE gen_apparatus ON COMMIT DROP AS
SELECT ap.id, ar.id AS revision_id, ap.tier, row_number() OVER (PARTITION BY ap.tier ORDER BY ap.id) - 1 AS k
FROM apparatus ap JOIN apparatus_revision ar ON ar.apparatus_id = ap.id WHERE ap.name LIKE '% no. %';
CREATE TEMP TABLE gen_apparatus_count ON COMMIT DROP AS SELECT tier, count(*) AS n FROM gen_apparatus GROUP BY tier;
CREATE INDEX ON gen_apparatus (tier, k);
ANALYZE gen_apparatus;

-- Applications: i < n are approved (each gets a permit); the rest are spread over the other states.
CREATE TEMP TABLE gen_app ON COMMIT DROP AS
SELECT s.i,
       gen_random_uuid() AS id,
       CASE WHEN s.i < :n THEN 'approved'
            WHEN s.i < :n * 1.08 THEN 'draft' WHEN s.i < :n * 1.13 THEN 'submitted' WHEN s.i < :n * 1.18 THEN 'in_review'
            WHEN s.i < :n * 1.21 THEN 'returned' WHEN s.i < :n * 1.25 THEN 'rejected' ELSE 'withdrawn' END::application_state AS state,
       t.tier,
       gu.id AS applicant_id,
       gu.department_id,
       now() - ((s.i * 7919) % 1095) * interval '1 day' - (s.i % 86400) * interval '1 second' AS created_at
FROM generate_series(0, (:n * 1.3)::int - 1) s(i)
JOIN gen_tier t ON t.i = s.i % 20
JOIN gen_user gu ON gu.k = (s.i * 31) % (SELECT count(*) FROM gen_user);
ANALYZE gen_app;

-- Revisions: one per submitted application; a fifth of the approved ones were returned once before.
CREATE TEMP TABLE gen_rev ON COMMIT DROP AS
SELECT gen_random_uuid() AS id, g.id AS application_id, rev, g.tier, g.applicant_id, g.created_at + rev * interval '1 day' AS at, g.i, g.state, g.department_id
FROM gen_app g
CROSS JOIN LATERAL generate_series(1, CASE WHEN g.state = 'approved' AND g.i % 5 = 0 THEN 2 ELSE 1 END) rev
WHERE g.state <> 'draft';
ANALYZE gen_rev;

CREATE TEMP TABLE gen_current ON COMMIT DROP AS
SELECT DISTINCT ON (application_id) application_id, id FROM gen_rev ORDER BY application_id, rev DESC;
CREATE INDEX ON gen_current (application_id);
ANALYZE gen_current;

INSERT INTO application (id, title, applicant_id, department_id, state, version, draft, draft_step, apparatus_id,
                         apparatus_revision_id, tier, current_revision_id, chain_step, submitted_at, waiting_since, decided_at,
                         created_at, updated_at)
SELECT g.id,
       (ARRAY['Open day sparks','First-year optics','Lightning in a jar','Corona and points','Charge and fields',
              'Spark gap calibration','Discharge tubes','Capacitor energy','Outreach evening','Research bench run'])[1 + g.i % 10]
         || ' ' || g.i,
       g.applicant_id, g.department_id, g.state, 1,
       CASE WHEN g.state = 'draft' THEN (SELECT draft FROM application WHERE state = 'draft' ORDER BY created_at LIMIT 1) ELSE '{}'::jsonb END,
       CASE WHEN g.state = 'draft' THEN 2 ELSE 5 END,
       ga.id, ga.revision_id, g.tier, (SELECT id FROM gen_current c WHERE c.application_id = g.id),
       CASE WHEN g.state = 'in_review' THEN 1 ELSE 0 END,
       CASE WHEN g.state <> 'draft' THEN g.created_at + interval '1 day' END,
       CASE WHEN g.state IN ('submitted', 'in_review') THEN g.created_at + interval '1 day' END,
       CASE WHEN g.state IN ('approved', 'rejected') THEN g.created_at + interval '5 days' END,
       g.created_at, g.created_at + interval '5 days'
FROM gen_app g
JOIN gen_apparatus_count gc ON gc.tier = g.tier
JOIN gen_apparatus ga ON ga.tier = g.tier AND ga.k = g.i % gc.n;

INSERT INTO application_revision (id, application_id, revision, content, assessment, tier, content_hash, submitted_by_id, submitted_at)
SELECT r.id, r.application_id, r.rev,
       p.content,
       p.assessment, r.tier, md5(r.id::text), r.applicant_id, r.at
FROM gen_rev r JOIN gen_pattern p ON p.tier = r.tier;


-- Signatures on the latest revision: the department's reviewer, then a safety officer.
CREATE TEMP TABLE gen_officer ON COMMIT DROP AS
SELECT id FROM app_user WHERE email = 'officer@benchclear.test';
CREATE TEMP TABLE gen_meaning ON COMMIT DROP AS SELECT DISTINCT ON (kind) kind, meaning FROM decision;

-- Generated decisions carry no seal here: scripts/lib/migrate.ts seals them with DECISION_HMAC_KEY right after
-- this script (scripts/bench/data.ts), and sets the column NOT NULL again.
ALTER TABLE decision ALTER COLUMN hmac DROP NOT NULL;
INSERT INTO decision (application_id, revision_id, kind, step, signer_id, signer_name, signer_role, meaning, content_hash, signed_at)
SELECT r.application_id, r.id, d.kind::decision_kind, d.step,
       CASE WHEN d.step = 1 THEN coalesce(rv.id, (SELECT id FROM gen_officer)) ELSE (SELECT id FROM gen_officer) END,
       CASE WHEN d.step = 1 THEN 'Rafael Quenby' ELSE 'Dana Whitlock' END,
       CASE WHEN d.step = 1 THEN 'Reviewer' ELSE 'Safety officer' END,
       (SELECT meaning FROM gen_meaning m WHERE m.kind = d.kind::decision_kind),
       md5(r.id::text), r.at + d.step * interval '1 hour'
FROM gen_rev r JOIN gen_current c ON c.id = r.id
LEFT JOIN gen_reviewer rv ON rv.department_id = r.department_id
JOIN LATERAL (
  SELECT * FROM (VALUES ('approve', 1, 'approved', 1, 1), ('recommend', 1, 'approved', 2, 4), ('approve', 2, 'approved', 2, 4),
                        ('recommend', 1, 'in_review', 1, 4), ('recommend', 1, 'rejected', 1, 4), ('reject', 2, 'rejected', 1, 4),
                        ('return', 1, 'returned', 1, 4)) v(kind, step, state, min_tier, max_tier)
) d ON d.state = r.state::text AND r.tier BETWEEN d.min_tier AND d.max_tier;

-- Permits: one per approved application, numbered per year after the demo's.
INSERT INTO permit (number, year, seq, application_id, revision_id, holder_id, state, tier, valid_from, valid_to,
                    verification_code, issued_at, revoked_at, revoked_by_id, revoked_reason, created_at, updated_at)
SELECT 'HV-' || y || '-' || lpad((1000 + s)::text, 6, '0'), y, 1000 + s, x.application_id, x.revision_id, x.applicant_id,
       CASE WHEN x.i % 33 = 0 THEN 'revoked' WHEN x.valid_to < current_date THEN 'expired' ELSE 'active' END::permit_state,
       x.tier, x.valid_from, x.valid_to,
       md5('code' || x.i || random()) || md5(x.application_id::text),
       x.issued_at,
       CASE WHEN x.i % 33 = 0 THEN x.issued_at + interval '3 days' END,
       CASE WHEN x.i % 33 = 0 THEN (SELECT id FROM gen_officer) END,
       CASE WHEN x.i % 33 = 0 THEN 'The set-up changed after approval.' END,
       x.issued_at, x.issued_at
FROM (
  SELECT g.i, g.id AS application_id, c.id AS revision_id, g.applicant_id, g.tier,
         (g.created_at + interval '5 days') AS issued_at,
         (g.created_at + interval '5 days')::date AS valid_from,
         (g.created_at + interval '5 days')::date + (30 + (g.i * 13) % 336) AS valid_to,
         extract(year FROM g.created_at + interval '5 days')::int AS y,
         row_number() OVER (PARTITION BY extract(year FROM g.created_at + interval '5 days') ORDER BY g.i) AS s
  FROM gen_app g JOIN gen_current c ON c.application_id = g.id
  WHERE g.state = 'approved'
) x;

UPDATE permit_counter SET last = greatest(last, (SELECT max(seq) FROM permit p WHERE p.year = permit_counter.year));
INSERT INTO permit_counter (year, last)
SELECT year, max(seq) FROM permit GROUP BY year ON CONFLICT (year) DO NOTHING;

-- Drafts for the autosave measurement: one per load-generator connection (and spare), each a copy of
-- the demo applicant's draft, found again by title.
INSERT INTO application (title, applicant_id, department_id, state, draft, draft_step, apparatus_id, apparatus_revision_id, tier)
SELECT 'Bench autosave draft ' || k, a.applicant_id, a.department_id, 'draft', a.draft, a.draft_step, a.apparatus_id,
       a.apparatus_revision_id, a.tier
FROM generate_series(1, 64) k,
     (SELECT * FROM application WHERE state = 'draft' AND title NOT LIKE 'Bench autosave%'
        AND applicant_id = (SELECT id FROM app_user WHERE email = 'instructor@benchclear.test')
      ORDER BY created_at LIMIT 1) a;
