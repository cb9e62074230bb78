import { Wordmark } from "@/components/ui/logo";
import { ResearchUseNote } from "@/components/ui/caution";

export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <main className="flex min-h-screen flex-col items-center justify-center px-4 py-10">
      <div className="w-full max-w-sm">
        <div className="mb-6 flex flex-col items-start gap-1">
          <Wordmark />
          <p className="text-xs text-ink-muted">Enzyme-inhibitor screening: plates, QC, potency, mechanism and Ki.</p>
        </div>
        <div className="card p-5">{children}</div>
        <ResearchUseNote className="mt-4" />
      </div>
    </main>
  );
}
