/**
 * Stand-in for `next/headers` in unit tests (vitest.config.mts aliases it): server actions called outside a request read
 * their cookies from this jar. Empty by default, so an installation without accounts behaves as it does in the app.
 */
const jar = new Map<string, string>();

/** For tests: set or clear the cookies the next action call sees. */
export const testCookieJar = {
  set: (name: string, value: string) => void jar.set(name, value),
  clear: () => jar.clear(),
};

export async function cookies() {
  return {
    get: (name: string) => (jar.has(name) ? { name, value: jar.get(name)! } : undefined),
    set: (name: string, value: string | { value: string }) => void jar.set(name, typeof value === "string" ? value : value.value),
    delete: (name: string) => void jar.delete(name),
  };
}

export async function headers() {
  return new Headers();
}
