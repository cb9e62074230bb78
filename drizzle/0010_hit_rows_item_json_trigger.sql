-- Each hit row keeps its API item (hitJson in src/server/services/hits.ts, same keys and
-- order) as JSON text, so a page of the hit grid joins 100 stored strings instead of formatting
-- 3,000 values per request. A trigger writes it, so no code path can leave it stale. Changing
-- the item's shape means a new migration that replaces this function and touches every row.
CREATE OR REPLACE FUNCTION hit_rows_item_json() RETURNS trigger AS $$
BEGIN
  NEW.item_json := (
    SELECT row_to_json(t)::text FROM (SELECT
      NEW.compound_id AS "registryId", NEW.name AS "name", NEW.mechanism AS "mechanism", NEW.mechanism_label AS "mechanismLabel",
      NEW.ki_um AS "ki", ARRAY[NEW.ki_lo_um, NEW.ki_hi_um] AS "kiCi95", NEW.kic_um AS "kic", NEW.kiu_um AS "kiu", NEW.alpha AS "alpha",
      NEW.ic50_um AS "ic50", NEW.ic50_qualifier AS "ic50Qualifier", ARRAY[NEW.ic50_lo_um, NEW.ic50_hi_um] AS "ic50Ci95", NEW.hill AS "hill",
      NEW.pct_inhibition AS "pctInhibition", NEW.hit AS "hit", NEW.p_ki AS "pKi", NEW.le AS "le", NEW.lipe AS "lipe",
      NEW.mw_g_per_mol AS "mw", NEW.clogp AS "clogp", NEW.heavy_atoms AS "heavyAtoms", NEW.flags AS "flags", NEW.flagged AS "flagged",
      NEW.status AS "status", NEW.owner_name AS "owner",
      to_char(NEW.status_changed_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "statusChangedAt",
      to_char(NEW.last_tested_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "lastTested",
      NEW.comment_count AS "comments") t);
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER hit_rows_item_json BEFORE INSERT OR UPDATE ON hit_rows
  FOR EACH ROW EXECUTE FUNCTION hit_rows_item_json();
--> statement-breakpoint
-- Rows written before this migration get their item now.
UPDATE hit_rows SET item_json = NULL;
