// Vitest setup: server actions read the session cookie through next/headers, which only
// exists inside a Next request. The mock below serves a real sealed cookie for whoever the
// test is acting as (see session.ts), so actions run their real guard path.
import { vi } from "vitest";
import { testRequestState } from "./request-state";

vi.mock("next/headers", () => ({
  cookies: async () => {
    const jar = testRequestState.cookies;
    return {
      get: (name: string) => (jar.has(name) ? { name, value: jar.get(name)! } : undefined),
      getAll: () => [...jar.entries()].map(([name, value]) => ({ name, value })),
      has: (name: string) => jar.has(name),
      set: (name: string | { name: string; value: string }, value?: string) => {
        if (typeof name === "object") jar.set(name.name, name.value);
        else jar.set(name, value ?? "");
      },
      delete: (name: string) => jar.delete(name),
    };
  },
  headers: async () => new Headers(testRequestState.headers),
}));

vi.mock("next/cache", () => ({
  revalidatePath: () => undefined,
  revalidateTag: () => undefined,
  unstable_cache: <T>(fn: T) => fn,
}));
