-- take_limits: count one attempt against several limits in one atomic step (server/utils/limits.ts).
-- keys[i] may have at most maxes[i] rows in the last windows[i] seconds. Every key is locked first
-- (a transaction-level advisory lock per key, in sorted order so two calls never wait in a circle;
-- the two-integer form keeps these locks apart from pg-boss's one-bigint locks), then counted;
-- only when all have room is one row per key inserted. The locks are held until the calling
-- statement's transaction ends, after the insert, so no two attempts can take the same last slot.
-- Returns 0 when counted, else the seconds until the fullest key has room again (nothing counted).
CREATE OR REPLACE FUNCTION take_limits(keys text[], maxes int[], windows int[], attempt_id uuid) RETURNS int
LANGUAGE plpgsql AS $$
DECLARE
  k text;
  i int;
  t timestamptz;
  nth timestamptz;
  wait int := 0;
BEGIN
  FOR k IN SELECT DISTINCT u FROM unnest(keys) AS u ORDER BY 1 LOOP
    PERFORM pg_advisory_xact_lock(7301, hashtext(k));
  END LOOP;
  t := clock_timestamp();
  FOR i IN 1 .. coalesce(array_length(keys, 1), 0) LOOP
    -- the max-th newest attempt in the window: when it leaves, there is room again
    SELECT h.at INTO nth FROM limit_hits h
      WHERE h.key = keys[i] AND h.at > t - make_interval(secs => windows[i])
      ORDER BY h.at DESC OFFSET maxes[i] - 1 LIMIT 1;
    IF nth IS NOT NULL THEN
      wait := greatest(wait, 1, ceil(extract(epoch FROM nth + make_interval(secs => windows[i]) - t))::int);
    END IF;
  END LOOP;
  IF wait > 0 THEN
    RETURN wait;
  END IF;
  INSERT INTO limit_hits (key, attempt, at) SELECT u, attempt_id, t FROM unnest(keys) AS u;
  -- housekeeping: no window is longer than a day
  DELETE FROM limit_hits WHERE at < t - interval '1 day';
  RETURN 0;
END
$$;
