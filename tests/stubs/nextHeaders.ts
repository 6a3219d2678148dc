/**
 * Stand-in for `next/headers` in unit tests (vitest.config.mts aliases it): server actions called outside a request read
 * their cookies and request headers from here. Empty by default, so an installation without accounts behaves as it does
 * in the app.
 */
const jar = new Map<string, string>();
const options = new Map<string, Record<string, unknown>>();
const requestHeaders = new Map<string, string>();

/** For tests: set or clear the cookies the next action call sees, and read the options a cookie was last set with. */
export const testCookieJar = {
  set: (name: string, value: string) => void jar.set(name, value),
  get: (name: string) => jar.get(name),
  optionsOf: (name: string) => options.get(name),
  clear: () => {
    jar.clear();
    options.clear();
  },
};

/** For tests: the request headers the next action call sees. */
export const testRequestHeaders = {
  set: (name: string, value: string) => void requestHeaders.set(name.toLowerCase(), value),
  clear: () => requestHeaders.clear(),
};

export async function cookies() {
  return {
    get: (name: string) => (jar.has(name) ? { name, value: jar.get(name)! } : undefined),
    set: (name: string, value: string | { value: string }, opts?: Record<string, unknown>) => {
      jar.set(name, typeof value === "string" ? value : value.value);
      options.set(name, opts ?? {});
    },
    delete: (name: string) => void jar.delete(name),
  };
}

export async function headers() {
  return new Headers([...requestHeaders]);
}
