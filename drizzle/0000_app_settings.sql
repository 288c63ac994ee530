-- The tenant of the current transaction, set by the server with set_config('app.firm_id', ..., true)
-- (see server/utils/db.ts). Empty or unset means no firm: row-level security then shows no rows.
CREATE FUNCTION app_firm_id() RETURNS uuid
  LANGUAGE sql STABLE PARALLEL SAFE
  AS $$ SELECT nullif(current_setting('app.firm_id', true), '')::uuid $$;
--> statement-breakpoint
-- The signed-in person of the current transaction (their memberships in other firms stay visible to them).
CREATE FUNCTION app_user_id() RETURNS uuid
  LANGUAGE sql STABLE PARALLEL SAFE
  AS $$ SELECT nullif(current_setting('app.user_id', true), '')::uuid $$;
