-- The one genealogy walk: every container a step run used, directly or as a part of a two-part
-- mix, one row per (use, container). The driver trace, the lot trace and the lot statistics all
-- read it. A UNION ALL of plain joins, so the planner pushes a filter on step_run_id or
-- container_id into each branch and each stays an index lookup (step_run_materials by run or
-- container, mixes by resin or hardener container).
CREATE VIEW "material_uses" AS
SELECT srm.id AS use_id, srm.step_run_id, srm.loaded_at, srm.quantity_used, srm.container_id,
       NULL::uuid AS mix_id, NULL::text AS mix_code, NULL::timestamptz AS mixed_at, NULL::text AS part, 0 AS part_ord
  FROM step_run_materials srm
 WHERE srm.container_id IS NOT NULL
UNION ALL
SELECT srm.id, srm.step_run_id, srm.loaded_at, srm.quantity_used, mx.resin_container_id,
       mx.id, mx.code, mx.mixed_at, 'resin'::text, 1
  FROM step_run_materials srm JOIN mixes mx ON mx.id = srm.mix_id
UNION ALL
SELECT srm.id, srm.step_run_id, srm.loaded_at, srm.quantity_used, mx.hardener_container_id,
       mx.id, mx.code, mx.mixed_at, 'hardener'::text, 2
  FROM step_run_materials srm JOIN mixes mx ON mx.id = srm.mix_id;
