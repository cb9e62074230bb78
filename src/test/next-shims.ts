// Test stand-ins for Next's request-scoped APIs, so route handlers and server actions can be
// called directly in vitest against the real database. Each call runs inside `withRequest`,
// which holds that request's cookies and headers (as Next does per request).
import { AsyncLocalStorage } from "node:async_hooks";

type Store = { cookies: Map<string, string>; headers: Headers };
export const requestStore = new AsyncLocalStorage<Store>();

export function withRequest<T>(
  init: { cookies?: Record<string, string>; headers?: Record<string, string> },
  fn: () => Promise<T>,
): Promise<T> {
  const store: Store = {
    cookies: new Map(Object.entries(init.cookies ?? {})),
    headers: new Headers(init.headers ?? {}),
  };
  return requestStore.run(store, fn);
}

function current(): Store {
  const s = requestStore.getStore();
  if (!s) throw new Error("cookies()/headers() called outside withRequest() in a test");
  return s;
}

export async function cookies() {
  const s = current();
  return {
    get: (name: string) => (s.cookies.has(name) ? { name, value: s.cookies.get(name)! } : undefined),
    getAll: () => [...s.cookies.entries()].map(([name, value]) => ({ name, value })),
    has: (name: string) => s.cookies.has(name),
    set: (name: string, value: string) => {
      if (value === "") s.cookies.delete(name);
      else s.cookies.set(name, value);
    },
    delete: (name: string) => s.cookies.delete(name),
  };
}

export async function headers() {
  return current().headers;
}

export function revalidatePath() {}
export function revalidateTag() {}
export function unstable_cache<T>(fn: T): T {
  return fn;
}
