-- Members of the snapshots published before the table existed, from each row's member list.
INSERT INTO "published_statistics_members" ("procedure_id", "peer_statistics_id")
SELECT DISTINCT m.id::uuid, ps.id
  FROM "peer_statistics" ps
 CROSS JOIN LATERAL jsonb_array_elements_text(ps.members) AS m(id)
 WHERE ps.version > 0
   AND jsonb_typeof(ps.members) = 'array'
   AND m.id ~* '^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$'
ON CONFLICT DO NOTHING;
