-- The responder's role (issue 18, item 6): an emergency responder's account that sees only where
-- high voltage is live today. Roles are the `role` enum (lib/roles.ts is the list).
ALTER TYPE "role" ADD VALUE IF NOT EXISTS 'responder';
