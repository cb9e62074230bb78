"use client";
import Link from "next/link";
import { useActionState, useEffect, useRef, useState } from "react";
import { FormMessage } from "@/components/forms/form-bits";
import { registerCompoundSchema, zodFieldErrors } from "@/lib/chem/validation";
import { BatchFields, StockFields } from "../[registryId]/compound-forms";
import { registerCompoundAction } from "../actions";
import type { PublicProperties } from "@/lib/chem/properties";

type Preview =
  | { kind: "empty" }
  | { kind: "loading" }
  | { kind: "error"; message: string }
  | ({ kind: "ok"; svg: string; removed: string[]; warnings: string[] } & PublicProperties);

/** Live structure preview: openchemlib (~1.1 MB) is loaded only when the chemist starts typing. */
function useStructurePreview(smiles: string): Preview {
  const [state, setState] = useState<{ text: string; preview: Preview }>({ text: "", preview: { kind: "empty" } });
  const text = smiles.trim();
  useEffect(() => {
    if (text === "") return;
    let cancelled = false;
    const t = setTimeout(async () => {
      const chem = await import("@/lib/chem");
      if (cancelled) return;
      const parsed = chem.parseStructure(/M {2}END/.test(smiles) ? { molfile: smiles } : { smiles: text });
      if (!parsed.ok) {
        setState({ text, preview: { kind: "error", message: parsed.error } });
        return;
      }
      const p = chem.computeProperties(parsed.molecule);
      setState({
        text,
        preview: {
          kind: "ok",
          svg: chem.structureSvg(parsed.molecule, {
            width: 360,
            height: 260,
            idPrefix: "preview-",
            stereoLabels: true,
          }),
          ...chem.publicProperties(p),
          removed: parsed.removedComponents,
          warnings: parsed.warnings,
        },
      });
    }, 250);
    return () => {
      cancelled = true;
      clearTimeout(t);
    };
  }, [smiles, text]);
  if (text === "") return { kind: "empty" };
  if (state.text === text) return state.preview;
  // While the new text is read, keep showing the last drawing rather than flashing.
  return state.preview.kind === "ok" ? state.preview : { kind: "loading" };
}

function nest(form: FormData): Record<string, unknown> {
  const out: Record<string, Record<string, unknown> | unknown> = {};
  for (const [k, v] of form.entries()) {
    if (k.startsWith("$ACTION")) continue;
    const [head, ...rest] = k.split(".");
    if (!head) continue;
    if (rest.length === 0) out[head] = v;
    else ((out[head] ??= {}) as Record<string, unknown>)[rest.join(".")] = v;
  }
  return out;
}

export function RegisterForm() {
  const [state, action, pending] = useActionState(registerCompoundAction, null);
  const [smiles, setSmiles] = useState("");
  const [clientErrors, setClientErrors] = useState<{ field: string; message: string }[]>([]);
  const preview = useStructurePreview(smiles);
  const formRef = useRef<HTMLFormElement>(null);
  const duplicateOf = state && !state.ok ? state.fieldErrors?.duplicateOf : undefined;
  const needsReason = state && !state.ok && !!state.fieldErrors?.distinctReason;
  const registered =
    state && state.ok ? (state.data as { registryId: string; warnings: string[] } | undefined) : undefined;

  function validate(e: React.FormEvent<HTMLFormElement>) {
    const parsed = registerCompoundSchema.safeParse(nest(new FormData(e.currentTarget)));
    if (!parsed.success) {
      e.preventDefault();
      setClientErrors(zodFieldErrors(parsed.error));
    } else setClientErrors([]);
  }

  const serverFieldErrors =
    state && !state.ok && state.fieldErrors
      ? Object.entries(state.fieldErrors).filter(([k]) => k !== "duplicateOf" && k !== "distinctReason")
      : [];

  return (
    <form
      ref={formRef}
      action={action}
      onSubmit={validate}
      className="grid grid-cols-1 gap-4 lg:grid-cols-[1fr_400px]"
      noValidate
    >
      <div className="flex flex-col gap-3">
        <section className="card flex flex-col gap-2 p-3">
          <label className="text-xs text-ink-muted" htmlFor="smiles">
            Structure: SMILES (or paste a molfile)
            <textarea
              id="smiles"
              name="smiles"
              className="input mt-1 h-20 font-mono"
              value={smiles}
              onChange={(e) => setSmiles(e.target.value)}
              spellCheck={false}
              placeholder="O=C(NC)c1ccnc(Nc2ccccc2)n1"
            />
          </label>
          <div className="grid grid-cols-1 gap-2 md:grid-cols-2">
            <label className="text-xs text-ink-muted" htmlFor="name">
              Name
              <input className="input mt-1" id="name" name="name" />
            </label>
            <label className="text-xs text-ink-muted" htmlFor="aliases">
              Aliases / supplier codes (separate with ;)
              <input className="input mt-1" id="aliases" name="aliases" />
            </label>
          </div>
          {needsReason ? (
            <label className="text-xs text-ink-muted" htmlFor="distinctReason">
              Why register this as a distinct compound? (e.g. &ldquo;stereo-unknown form&rdquo;)
              <input className="input mt-1" id="distinctReason" name="distinctReason" required />
            </label>
          ) : null}
        </section>
        <section className="card flex flex-col gap-2 p-3">
          <h2 className="text-sm font-semibold">First batch (optional)</h2>
          <div className="grid grid-cols-2 gap-2 md:grid-cols-5">
            <BatchFields />
          </div>
          <h2 className="mt-1 text-sm font-semibold">Stock solution from this batch (optional)</h2>
          <div className="grid grid-cols-2 gap-2 md:grid-cols-5">
            <StockFields />
          </div>
        </section>
        {clientErrors.length > 0 ? (
          <ul role="alert" className="rounded bg-fail-soft px-2 py-1.5 text-sm text-fail">
            {clientErrors.map((e) => (
              <li key={e.field + e.message}>
                {e.field}: {e.message}
              </li>
            ))}
          </ul>
        ) : null}
        {serverFieldErrors.length > 0 ? (
          <ul className="text-xs text-fail">
            {serverFieldErrors.map(([k, v]) => (
              <li key={k}>
                {k}: {v}
              </li>
            ))}
          </ul>
        ) : null}
        <FormMessage state={state} />
        {duplicateOf ? (
          <p className="rounded border border-info/40 bg-info-soft px-2 py-1.5 text-sm">
            <Link href={`/compounds/${duplicateOf}#add-batch`}>Add a batch to {duplicateOf}</Link>
            {needsReason ? " — or give a reason above and register again." : " instead."}
          </p>
        ) : null}
        {registered ? (
          <p className="text-sm">
            <Link href={`/compounds/${registered.registryId}`}>Open {registered.registryId}</Link>
            {registered.warnings.length ? (
              <span className="ml-2 text-xs text-warn">{registered.warnings.join(" ")}</span>
            ) : null}
          </p>
        ) : null}
        <div>
          <button type="submit" className="btn-primary" disabled={pending}>
            {pending ? "Registering…" : "Register compound"}
          </button>
        </div>
      </div>

      <aside className="card flex flex-col gap-2 p-3" aria-label="Structure preview">
        <h2 className="text-sm font-semibold">Preview</h2>
        {preview.kind === "empty" ? (
          <p className="text-sm text-ink-muted">
            Type or paste a structure to see it drawn, with its computed properties.
          </p>
        ) : null}
        {preview.kind === "loading" ? <p className="text-sm text-ink-muted">Reading the structure…</p> : null}
        {preview.kind === "error" ? (
          <p role="alert" className="rounded bg-fail-soft px-2 py-1.5 text-sm text-fail">
            {preview.message}
          </p>
        ) : null}
        {preview.kind === "ok" ? (
          <>
            <div
              className="flex justify-center rounded bg-paper-raised"
              dangerouslySetInnerHTML={{ __html: preview.svg }}
            />
            {preview.removed.length ? (
              <p className="text-xs text-warn">
                Largest component kept; {preview.removed.join(", ")} will be the batch&rsquo;s salt form.
              </p>
            ) : null}
            {preview.warnings.map((w) => (
              <p key={w} className="text-xs text-warn">
                {w}
              </p>
            ))}
            <table className="table-dense">
              <tbody>
                {(
                  [
                    ["Formula", preview.formula, ""],
                    ["Molecular weight", preview.mw.toFixed(2), "g/mol"],
                    ["Exact mass", preview.exactMass.toFixed(4), "Da"],
                    ["Heavy atoms", String(preview.heavyAtoms), ""],
                    ["cLogP (estimate)", preview.clogp.toFixed(2), ""],
                    ["H-bond donors / acceptors (rule of five)", `${preview.hbd} / ${preview.hba}`, ""],
                    ["TPSA", preview.tpsa.toFixed(1), "Å²"],
                    ["Rotatable bonds", String(preview.rotatableBonds), ""],
                  ] as const
                ).map(([k, v, u]) => (
                  <tr key={k}>
                    <th className="font-normal">{k}</th>
                    <td className="num text-right">{v}</td>
                    <td className="w-12 text-xs text-ink-muted">{u}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <p className="text-2xs text-ink-muted">Acceptors follow the rule-of-five definition: every N and O atom.</p>
          </>
        ) : null}
      </aside>
    </form>
  );
}
