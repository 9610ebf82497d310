-- A block may overlap another block of its site only when a person says why.
ALTER TABLE `blocks` ADD `overlap_reason` text;--> statement-breakpoint
-- What a block's status was before its night report set it, so deleting the report restores it
-- (null for outcomes older than this column: those blocks go back to `planned`).
ALTER TABLE `block_outcomes` ADD `previous_status` text;--> statement-breakpoint
-- Who wrote an audit entry and how: the user's name as it was, the token used over HTTP, and
-- whether the change came through the API, the command line or the store itself (demo, start-up).
ALTER TABLE `audit_trail` ADD `actor_name` text;--> statement-breakpoint
ALTER TABLE `audit_trail` ADD `via` text;--> statement-breakpoint
ALTER TABLE `audit_trail` ADD `token_id` integer REFERENCES tokens(id) ON DELETE SET NULL;
