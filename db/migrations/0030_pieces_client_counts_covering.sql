-- The clients list shows each client's piece counts (all, and not yet registered) and filters by
-- unregistered or paused pieces (lib/clients/list.ts): a subquery per row of the page, by client. With
-- archived_at, owner_id and reminders_paused in the client index those subqueries read the index
-- alone, not each piece's row (lookups by client alone use the same index as before).
DROP INDEX `pieces_client_idx`;--> statement-breakpoint
CREATE INDEX `pieces_client_idx` ON `pieces` (`client_id`,`archived_at`,`owner_id`,`reminders_paused`);