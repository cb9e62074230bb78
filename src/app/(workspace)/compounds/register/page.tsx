import Link from "next/link";
import { notFound } from "next/navigation";
import { pageUser } from "@/server/auth/page-guard";
import { canWriteCompounds } from "@/server/auth/compound-access";
import { ChemicalSafetyNote } from "@/components/ui/caution";
import { COMPUTED_PROPERTIES_CAUTION } from "@/lib/chem/cautions";
import { RegisterForm } from "./register-form";

export const metadata = { title: "Register a compound" };
export const dynamic = "force-dynamic";

export default async function RegisterPage() {
  const user = await pageUser();
  if (!(await canWriteCompounds(user))) notFound();
  return (
    <main className="mx-auto w-full max-w-6xl px-6 py-6">
      <p className="mb-1 text-xs text-ink-muted">
        <Link href="/compounds">Compound registry</Link> / register
      </p>
      <h1 className="mb-1">Register a compound</h1>
      <p className="mb-3 text-sm text-ink-muted">
        The system gives the registry ID. A salt or solvate is recorded on the batch; the parent structure is
        registered. The same structure registered before is not registered again: add a batch to it instead.
      </p>
      <ChemicalSafetyNote className="mb-3" />
      <RegisterForm />
      <p className="mt-3 text-2xs text-ink-muted">{COMPUTED_PROPERTIES_CAUTION}</p>
    </main>
  );
}
