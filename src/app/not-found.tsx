import Link from "next/link";
import { connection } from "next/server";

export default async function NotFound() {
  // Rendered per request, not prerendered: a prerendered page carries no CSP script nonce (src/proxy.ts).
  await connection();
  return (
    <main className="mx-auto max-w-md px-6 py-16">
      <h1 className="mb-2">Not found</h1>
      <p className="mb-4 text-sm text-ink-muted">
        This page does not exist, or it belongs to a campaign you are not a member of.
      </p>
      <Link href="/campaigns">Back to your campaigns</Link>
    </main>
  );
}
