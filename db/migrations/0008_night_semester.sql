-- The label of the allocation a night came with (a semester, a run), for allocations in bulk.
ALTER TABLE `nights` ADD `semester` text DEFAULT '' NOT NULL;
