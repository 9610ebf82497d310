-- A periapsis repeat's spacing is an ISO 8601 duration: { "everyHours": 2 } becomes { "step": "PT2H" },
-- in a campaign's goals and in each target's own settings (goals.targets by target id).
UPDATE `campaigns` SET `goals` = json_set(`goals`, '$.periapsisRepeat', json_object('step', 'PT' || json_extract(`goals`, '$.periapsisRepeat.everyHours') || 'H'))
WHERE json_extract(`goals`, '$.periapsisRepeat.everyHours') IS NOT NULL;
--> statement-breakpoint
UPDATE `campaigns` SET `goals` = json_set(`goals`, '$.targets', (
  SELECT json_group_object(t.key, CASE
    WHEN json_extract(t.value, '$.periapsisRepeat.everyHours') IS NOT NULL
    THEN json_set(t.value, '$.periapsisRepeat', json_object('step', 'PT' || json_extract(t.value, '$.periapsisRepeat.everyHours') || 'H'))
    ELSE json(t.value) END)
  FROM json_each(`campaigns`.`goals`, '$.targets') AS t))
WHERE EXISTS (
  SELECT 1 FROM json_each(`campaigns`.`goals`, '$.targets') AS t
  WHERE json_extract(t.value, '$.periapsisRepeat.everyHours') IS NOT NULL);
