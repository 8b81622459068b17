-- Messages queued before categories existed got the column default 'account'; give them their template's
-- category (lib/email/categories.ts at the time of writing) so the outbox page and its filter tell the truth.
UPDATE `outbox` SET `category` = CASE `template`
  WHEN 'proposal-accepted' THEN 'proposals'
  WHEN 'proposal-declined' THEN 'proposals'
  WHEN 'proposal-merged' THEN 'proposals'
  WHEN 'campaign-funded' THEN 'funding'
  WHEN 'campaign-scheduled' THEN 'campaign-updates'
  WHEN 'campaign-date-slipped' THEN 'campaign-updates'
  WHEN 'lab-note' THEN 'campaign-updates'
  WHEN 'report-published' THEN 'reports'
  ELSE `category`
END
WHERE `category` = 'account';
