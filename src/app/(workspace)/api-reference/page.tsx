import { pageUser } from "@/server/auth/page-guard";
import { buildOpenApiDocument } from "@/server/openapi";
import { ChemicalSafetyNote, ResearchUseNote } from "@/components/ui/caution";

export const metadata = { title: "API reference" };

type Schema = Record<string, unknown>;
type Param = { name: string; in: string; required: boolean; schema: Schema };
type Operation = {
  operationId: string;
  summary: string;
  description: string;
  tags: string[];
  security: Record<string, unknown>[];
  parameters?: Param[];
  requestBody?: { content: Record<string, { schema: Schema; example?: unknown }> };
  responses: Record<string, { description: string; content?: Record<string, unknown> }>;
};

/** One line that says what a JSON Schema accepts: type, bounds, enum, format, default. */
function typeOf(s: Schema): string {
  if ("const" in s) return `= ${JSON.stringify(s.const)}`;
  const branches = (s.anyOf ?? s.oneOf) as Schema[] | undefined;
  if (branches) return branches.map(typeOf).join(" | ");
  const bits: string[] = [];
  const t = Array.isArray(s.type) ? (s.type as string[]).join(" | ") : String(s.type ?? "any");
  if (s.format === "binary") bits.push("file");
  else if (Array.isArray(s.enum)) bits.push((s.enum as unknown[]).map((v) => JSON.stringify(v)).join(" | "));
  else if (t === "array") bits.push(`array of ${typeOf((s.items ?? {}) as Schema)}`);
  else bits.push(s.format ? `${t} (${s.format})` : t);
  const range = (lo: unknown, hi: unknown, unit = "") =>
    lo !== undefined && hi !== undefined
      ? `${lo}–${hi}${unit}`
      : lo !== undefined
        ? `≥ ${lo}${unit}`
        : hi !== undefined
          ? `≤ ${hi}${unit}`
          : null;
  const len = range(s.minLength, s.maxLength, " characters");
  const items = range(s.minItems, s.maxItems, " items");
  const num = range(s.minimum ?? (s.exclusiveMinimum !== undefined ? `> ${s.exclusiveMinimum}` : undefined), s.maximum);
  for (const b of [len, items, num]) if (b) bits.push(b);
  if (s.pattern && s.format !== "uuid") bits.push(`pattern ${String(s.pattern)}`);
  if ("default" in s) bits.push(`default ${JSON.stringify(s.default)}`);
  return bits.join(", ");
}

/** The fields of an object schema, nested objects flattened with dotted names. */
function fieldsOf(s: Schema, prefix = ""): { name: string; required: boolean; type: string; note?: string }[] {
  const props = (s.properties ?? {}) as Record<string, Schema>;
  const required = new Set((s.required ?? []) as string[]);
  return Object.entries(props).flatMap(([k, p]) => {
    const name = prefix + k;
    const unit = unitOf(k);
    const type = unit ? `${typeOf(p)} (${unit})` : typeOf(p);
    const row = { name, required: required.has(k), type, note: p.description as string | undefined };
    return p.type === "object" && p.properties ? [{ ...row, type: "object" }, ...fieldsOf(p, `${name}.`)] : [row];
  });
}

const METHOD_STYLE: Record<string, string> = {
  get: "bg-info-soft text-info",
  post: "bg-accent-soft text-accent-strong",
  patch: "bg-warn-soft text-warn",
  put: "bg-warn-soft text-warn",
  delete: "bg-fail-soft text-fail",
};

function authOf(op: Operation): string {
  const names = op.security.flatMap((r) => Object.keys(r));
  if (names.length === 0) return "no sign-in";
  return names.includes("bearerAuth") ? "session or personal token" : "browser session only";
}

/** Units the field names carry by the project's naming rule (`concentrationMm`, `volumeUl`, `thresholdPct`). */
const UNIT_SUFFIXES: [RegExp, string][] = [
  [/Pct$/, "%"],
  [/Mm$/, "mM"],
  [/Um$/, "µM"],
  [/Nm$/, "nM"],
  [/Ul$/, "µL"],
  [/Ml$/, "mL"],
  [/Mg$/, "mg"],
];
function unitOf(name: string): string | null {
  return UNIT_SUFFIXES.find(([re]) => re.test(name))?.[1] ?? null;
}

/** Renders `backticked` words of a description as code. */
function Prose({ text }: { text: string }) {
  return (
    <>
      {text.split("`").map((part, i) =>
        i % 2 ? (
          <code key={i} className="font-mono">
            {part}
          </code>
        ) : (
          part
        ),
      )}
    </>
  );
}

function slug(s: string) {
  return s.toLowerCase().replace(/[^a-z0-9]+/g, "-");
}

export default async function ApiReferencePage() {
  await pageUser();
  const doc = buildOpenApiDocument();
  const ops = Object.entries(doc.paths).flatMap(([path, methods]) =>
    Object.entries(methods).map(([method, op]) => ({ path, method, op: op as Operation })),
  );
  const groups = doc.tags.map((t) => ({ tag: t.name, ops: ops.filter((o) => o.op.tags[0] === t.name) }));

  return (
    <div className="flex w-full">
      <nav
        aria-label="API sections"
        className="sticky top-0 hidden h-screen w-52 shrink-0 overflow-y-auto border-r border-rule px-3 py-5 text-sm lg:block"
      >
        <p className="mb-2 text-2xs font-medium uppercase tracking-wide text-ink-muted">Resources</p>
        <ul className="space-y-1">
          {groups.map((g) => (
            <li key={g.tag}>
              <a href={`#${slug(g.tag)}`} className="text-ink-soft hover:text-ink">
                {g.tag} <span className="num text-ink-faint">{g.ops.length}</span>
              </a>
            </li>
          ))}
        </ul>
      </nav>
      <main className="mx-auto w-full max-w-5xl px-6 py-6">
        <h1 className="mb-1">API reference</h1>
        <p className="mb-3 max-w-3xl text-sm text-ink-soft">
          Every JSON route, built from the validators the server itself uses, so this page and the server cannot
          disagree. The same document, for client generators and scripts, is at{" "}
          <a href="/api/openapi.json" className="font-mono">
            /api/openapi.json
          </a>{" "}
          (OpenAPI {doc.openapi}, JSON Schema 2020-12). Scripts send a personal token as{" "}
          <code className="font-mono">Authorization: Bearer …</code>; a read token never writes. Errors come back as{" "}
          <code className="font-mono">{"{ error, code, details? }"}</code> with a sentence saying what is wrong and
          where.
        </p>
        <ResearchUseNote className="mb-2" />
        <ChemicalSafetyNote className="mb-6 max-w-3xl" />
        {groups.map((g) => (
          <section key={g.tag} id={slug(g.tag)} className="mb-8">
            <h2 className="mb-2 border-b border-rule-strong pb-1">{g.tag}</h2>
            <div className="space-y-3">
              {g.ops.map(({ path, method, op }) => (
                <OperationCard key={op.operationId} path={path} method={method} op={op} />
              ))}
            </div>
          </section>
        ))}
      </main>
    </div>
  );
}

function OperationCard({ path, method, op }: { path: string; method: string; op: Operation }) {
  const [purpose, who] = op.description.includes("Who may call:")
    ? [op.description.split("Who may call:")[0]!.trim(), op.description.split("Who may call:")[1]!.trim()]
    : [op.description, ""];
  const body = op.requestBody ? Object.entries(op.requestBody.content)[0] : undefined;
  const params = op.parameters ?? [];
  return (
    <article id={op.operationId} className="card px-3 py-2.5">
      <header className="flex flex-wrap items-baseline gap-2">
        <span className={`chip w-14 justify-center font-mono uppercase ${METHOD_STYLE[method] ?? ""}`}>{method}</span>
        <code className="font-mono text-sm text-ink">{path}</code>
        <span className="text-sm text-ink-soft">{op.summary}</span>
      </header>
      <dl className="mt-1.5 grid grid-cols-[8rem_1fr] gap-x-3 gap-y-0.5 text-xs">
        <dt className="text-ink-muted">Who may call</dt>
        <dd>{who}</dd>
        <dt className="text-ink-muted">Authentication</dt>
        <dd>{authOf(op)}</dd>
        {purpose ? (
          <>
            <dt className="text-ink-muted">Notes</dt>
            <dd>
              <Prose text={purpose} />
            </dd>
          </>
        ) : null}
      </dl>
      {params.length ? (
        <table className="table-dense mt-2">
          <thead>
            <tr>
              <th className="w-48">Parameter</th>
              <th className="w-16">In</th>
              <th>Accepts</th>
            </tr>
          </thead>
          <tbody>
            {params.map((p) => (
              <tr key={`${p.in}-${p.name}`}>
                <td className="font-mono text-xs">
                  {p.name}
                  {p.required ? <span className="text-fail"> *</span> : null}
                </td>
                <td className="text-xs text-ink-muted">{p.in}</td>
                <td className="font-mono text-xs text-ink-soft">
                  {typeOf(p.schema)}
                  {unitOf(p.name) ? ` (${unitOf(p.name)})` : ""}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
      {body ? (
        <div className="mt-2">
          <p className="text-xs text-ink-muted">
            Body <code className="font-mono">{body[0]}</code>
          </p>
          <div className="mt-1 grid gap-3 md:grid-cols-[1fr_18rem]">
            <table className="table-dense">
              <thead>
                <tr>
                  <th className="w-48">Field</th>
                  <th>Accepts</th>
                </tr>
              </thead>
              <tbody>
                {fieldsOf(body[1].schema).map((f) => (
                  <tr key={f.name}>
                    <td className="font-mono text-xs">
                      {f.name}
                      {f.required ? <span className="text-fail"> *</span> : null}
                    </td>
                    <td className="font-mono text-xs text-ink-soft">{f.type}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            {body[1].example !== undefined ? (
              <pre className="overflow-x-auto rounded bg-paper-sunk p-2 font-mono text-2xs text-ink-soft">
                {JSON.stringify(body[1].example, null, 2)}
              </pre>
            ) : null}
          </div>
        </div>
      ) : null}
      <ul className="mt-2 flex flex-wrap gap-x-4 gap-y-0.5 text-xs">
        {Object.entries(op.responses).map(([status, r]) => (
          <li key={status}>
            <span className={`num font-mono ${Number(status) < 400 ? "text-pass" : "text-ink-muted"}`}>{status}</span>{" "}
            <span className="text-ink-soft">
              <Prose text={r.description} />
            </span>
          </li>
        ))}
      </ul>
    </article>
  );
}
