// GET /api/v1/register?<filter>&sort=&dir=&after=<cursor>&limit=&count=1 — one keyset page
// of the joint register (the grid's data source and the JSON API): rows in canonical SI,
// `next` is the cursor of the following page (null on the last), `count` (when asked):
// `{ value, isExact, isEstimate, counting }` — exact, or (isExact false) the optimizer's
// estimate while an exact count runs in the background (`counting`); `count=only` answers
// `{ count, timeZone }` alone, which the screen asks again until the count is exact. `from`/`to` are local days in the organisation's
// time zone, named in `timeZone`; `madeAt` stays an ISO 8601 UTC instant.
import { defineRoute } from "@/app/_lib/guard";
import { countRegister, listRegisterPage } from "@/database/queries/register";
import { decodeCursor, encodeCursor, pickFilter, registerPageQuerySchema } from "@/domain/register";
import { AppError } from "@/domain/result";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "viewRegister", schema: registerPageQuerySchema, input: "query" }, async (query) => {
  let after;
  if (query.after) {
    const decoded = decodeCursor(query.after, { sort: query.sort, dir: query.dir });
    if (!decoded.ok) throw new AppError("invalid", decoded.message, { after: [decoded.message] });
    after = decoded.cursor;
  }
  const filter = pickFilter(query);
  const timeZone = await organisationTimeZone();
  if (query.count === "only") return Response.json({ count: await countRegister({ filter, timeZone }), timeZone }, { headers: { "cache-control": "no-store" } });
  const page = await listRegisterPage({ filter, timeZone, sort: query.sort, dir: query.dir, after, limit: query.limit, withCount: query.count === "1" });
  return Response.json(
    { rows: page.rows, next: page.next ? encodeCursor(page.next) : null, timeZone, ...(page.count ? { count: page.count } : {}) },
    { headers: { "cache-control": "no-store" } },
  );
});
