-- Invitation links carry a raw sign-up token. New invitation mail stores only the invitation's id and
-- rebuilds the link when it is rendered; drop the links kept in mail already sent before that change.
-- Queued and failed rows keep theirs until they are sent (the worker drops it on acceptance).
UPDATE "mail_outbox" SET "data" = "data" - 'url' WHERE "kind" = 'invitation' AND "status" = 'sent';
