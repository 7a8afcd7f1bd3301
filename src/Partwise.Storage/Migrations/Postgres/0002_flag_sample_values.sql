-- The flagged sample's values as the caller sent them (a JSON object from part name to value), so that a reviewer can
-- read them and place the sample on the baseline's biplot. Null for flags raised before this column existed.
ALTER TABLE flags ADD COLUMN sample_values text NULL;
