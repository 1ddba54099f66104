// What the mocked next/headers answers in action tests: the current cookie jar and headers.
export const testRequestState = {
  cookies: new Map<string, string>(),
  headers: { "x-forwarded-for": "127.0.0.1" } as Record<string, string>,
};
