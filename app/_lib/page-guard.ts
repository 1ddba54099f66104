// Page-level convenience: send signed-out visitors to sign-in and show "not allowed" for
// someone without the page's permission. The real guard is in every action and route
// handler (guard.ts), which names the same permission.
import { notFound, redirect } from "next/navigation";
import { cache } from "react";
import type { UserRecord } from "@/database/queries/users";
import { can, type Permission } from "@/domain/roles";
import { parseId, type IdColumn } from "@/domain/form-fields";
import { currentUser } from "./session";

/**
 * The signed-in person of the page being rendered, read once per request: the signed-in
 * layout and the page below it both ask (React's `cache` keeps the answer for the one
 * server render; outside a render, in actions and route handlers, it reads every time).
 */
export const pageUser = cache(currentUser);

/** The signed-in person; with a permission, a page for those who hold it (others get 404). */
export async function requireUser(permission?: Permission): Promise<UserRecord> {
  const user = await pageUser();
  if (!user) redirect("/sign-in");
  if (permission && !can(user, permission)) notFound();
  return user;
}

/** The id of an `[id]` page: plain digits within the id column's range, or the page is not found. */
export async function requirePageId(params: Promise<{ id: string }>, column: IdColumn = "int"): Promise<number> {
  const id = parseId((await params).id, column);
  if (id === null) notFound();
  return id;
}
