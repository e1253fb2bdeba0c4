-- The reference cohort for tests/perf/compare.sh, run by DuckDB straight from the CSV
-- files: for each month-end from --from to --to, by practice, the registered patients and
-- those with at least 10 medicines running (a supply runs from its dispensing for its days
-- supply, 28 days when none is given, plus a 30-day grace period; a medicine is a distinct
-- product description). It does less than `medload cohort` (no product resolution, no
-- dosage reading, no ACB or DBI), so it is a lower bound on the work.
WITH dispensed AS (
  SELECT patient_id, product, CAST(dispensed_on AS DATE) AS dispensed_on,
         COALESCE(TRY_CAST(days_supply AS INTEGER), 28) AS days
  FROM read_csv({DISPENSING}, header = true, all_varchar = true, normalize_names = true)
),
registry AS (
  SELECT patient_id, practice, TRY_CAST(registered_from AS DATE) AS registered_from,
         TRY_CAST(registered_to AS DATE) AS registered_to
  FROM read_csv({PATIENTS}, header = true, all_varchar = true, normalize_names = true)
),
census AS (
  SELECT CAST(last_day(CAST(month AS DATE)) AS DATE) AS on_date
  FROM range(DATE {FROM_MONTH}, DATE {TO} + INTERVAL 1 DAY, INTERVAL 1 MONTH) AS months(month)
),
running AS (
  SELECT c.on_date, d.patient_id, COUNT(DISTINCT d.product) AS items
  FROM census AS c
  JOIN dispensed AS d
    ON d.dispensed_on <= c.on_date AND d.dispensed_on + d.days + 30 > c.on_date
  GROUP BY c.on_date, d.patient_id
),
registered AS (
  SELECT c.on_date, r.patient_id, r.practice
  FROM census AS c
  JOIN registry AS r
    ON (r.registered_from IS NULL OR r.registered_from <= c.on_date)
   AND (r.registered_to IS NULL OR r.registered_to >= c.on_date)
)
SELECT g.on_date, g.practice, COUNT(*) AS registered,
       COUNT(*) FILTER (WHERE u.items >= 10) AS items_at_least_10
FROM registered AS g
LEFT JOIN running AS u ON u.on_date = g.on_date AND u.patient_id = g.patient_id
GROUP BY g.on_date, g.practice
ORDER BY g.on_date, g.practice;
