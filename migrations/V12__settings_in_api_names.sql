-- A pool's settings are kept in one JSON shape, the one the API and the settings form use
-- (dev.dowser.rounds.SettingsJson): snake_case names. Documents written before this used the code's
-- camelCase names for seven fields; rename them wherever settings are kept: with the pool, with each
-- round (its provenance) and in the settings history. A field name appears in quotes and no value
-- holds it, so a plain text replacement is exact, and it works alike on H2 and PostgreSQL.

UPDATE pools SET settings = REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(settings,
        '"batchSize"', '"batch_size"'),
        '"spotCheckShare"', '"spot_check_share"'),
        '"leaseMinutes"', '"lease_minutes"'),
        '"doubleLabelShare"', '"double_label_share"'),
        '"reburnInSteps"', '"reburn_in_steps"'),
        '"stopAgreement"', '"stop_agreement"'),
        '"coldStart"', '"cold_start"');

UPDATE rounds SET settings = REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(settings,
        '"batchSize"', '"batch_size"'),
        '"spotCheckShare"', '"spot_check_share"'),
        '"leaseMinutes"', '"lease_minutes"'),
        '"doubleLabelShare"', '"double_label_share"'),
        '"reburnInSteps"', '"reburn_in_steps"'),
        '"stopAgreement"', '"stop_agreement"'),
        '"coldStart"', '"cold_start"')
WHERE settings IS NOT NULL;

UPDATE history SET before_value = REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(before_value,
        '"batchSize"', '"batch_size"'),
        '"spotCheckShare"', '"spot_check_share"'),
        '"leaseMinutes"', '"lease_minutes"'),
        '"doubleLabelShare"', '"double_label_share"'),
        '"reburnInSteps"', '"reburn_in_steps"'),
        '"stopAgreement"', '"stop_agreement"'),
        '"coldStart"', '"cold_start"'),
    after_value = REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(after_value,
        '"batchSize"', '"batch_size"'),
        '"spotCheckShare"', '"spot_check_share"'),
        '"leaseMinutes"', '"lease_minutes"'),
        '"doubleLabelShare"', '"double_label_share"'),
        '"reburnInSteps"', '"reburn_in_steps"'),
        '"stopAgreement"', '"stop_agreement"'),
        '"coldStart"', '"cold_start"')
WHERE subject = 'settings' AND pool_id IS NOT NULL;
