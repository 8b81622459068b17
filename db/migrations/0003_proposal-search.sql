-- Full-text search over proposals for the triage table. External-content FTS5 keyed by the
-- proposal table's implicit rowid; triggers keep it in step with every insert, update and delete.
CREATE VIRTUAL TABLE `proposal_fts` USING fts5(title, why, description_md, content='proposal', content_rowid='rowid', tokenize='unicode61 remove_diacritics 2');
--> statement-breakpoint
INSERT INTO `proposal_fts`(rowid, title, why, description_md) SELECT rowid, title, why, description_md FROM `proposal`;
--> statement-breakpoint
CREATE TRIGGER `proposal_fts_insert` AFTER INSERT ON `proposal` BEGIN
  INSERT INTO `proposal_fts`(rowid, title, why, description_md) VALUES (new.rowid, new.title, new.why, new.description_md);
END;
--> statement-breakpoint
CREATE TRIGGER `proposal_fts_delete` AFTER DELETE ON `proposal` BEGIN
  INSERT INTO `proposal_fts`(`proposal_fts`, rowid, title, why, description_md) VALUES ('delete', old.rowid, old.title, old.why, old.description_md);
END;
--> statement-breakpoint
CREATE TRIGGER `proposal_fts_update` AFTER UPDATE OF title, why, description_md ON `proposal` BEGIN
  INSERT INTO `proposal_fts`(`proposal_fts`, rowid, title, why, description_md) VALUES ('delete', old.rowid, old.title, old.why, old.description_md);
  INSERT INTO `proposal_fts`(rowid, title, why, description_md) VALUES (new.rowid, new.title, new.why, new.description_md);
END;
--> statement-breakpoint
UPDATE `proposal` SET `vote_count` = (SELECT count(*) FROM `proposal_vote` WHERE `proposal_vote`.`proposal_id` = `proposal`.`id`);
