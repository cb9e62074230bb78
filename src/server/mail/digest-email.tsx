import { Body, Container, Head, Heading, Hr, Html, Link, Preview, Section, Text } from "@react-email/components";
import { formatConcentration } from "@/lib/units";

export type DigestData = {
  campaign: { id: string; name: string; targetEnzyme: string };
  appUrl: string;
  from: Date;
  to: Date;
  week: string;
  compoundsRegistered: { registryId: string; name: string | null }[];
  compoundsRegisteredTotal: number;
  runs: {
    total: number;
    failedQc: number;
    accepted: number;
    failed: { id: string; fileName: string; zPrime: number | null; reason: string | null }[];
  };
  newHits: { compoundId: string; pctInhibition: number | null }[];
  mechanismCalls: {
    compoundId: string;
    mechanism: string | null;
    label: string | null;
    /** Why an "inadequate" or "ambiguous" call is one, in words (null otherwise). */
    note: string | null;
    kiUm: number | null;
    experimentId: string;
  }[];
  triage: { compoundId: string; action: string; by: string | null; at: Date; detail: string }[];
  topTen: {
    compoundId: string;
    mechanism: string | null;
    kiUm: number | null;
    ic50Um: number | null;
    flagged: boolean;
    inadequate: boolean;
    note: string | null;
  }[];
};

const c = { ink: "#1d2630", muted: "#66737f", rule: "#e3e0d8", accent: "#0f766e", paper: "#fbfaf7", warn: "#a16207" };
const h2 = { fontSize: "14px", margin: "18px 0 6px", color: c.ink } as const;
const small = { fontSize: "12px", color: c.muted, margin: "2px 0" } as const;
const row = { fontSize: "13px", color: c.ink, margin: "2px 0" } as const;
const fmtDate = (d: Date) => d.toISOString().slice(0, 10);

/** The weekly digest: calm, one column, every figure with its unit, every item linked back. */
export function DigestEmail({
  d,
  recipientName,
  optOutUrl,
}: {
  d: DigestData;
  recipientName: string;
  optOutUrl: string;
}) {
  const base = `${d.appUrl}/campaigns/${d.campaign.id}`;
  return (
    <Html lang="en">
      <Head />
      <Preview>
        {`${d.campaign.name}: ${d.runs.total} plate runs, ${d.newHits.length} new hits, ${d.mechanismCalls.length} mechanism calls this week`}
      </Preview>
      <Body
        style={{
          backgroundColor: c.paper,
          fontFamily: "Inter, Helvetica, Arial, sans-serif",
          margin: 0,
          padding: "16px 0",
        }}
      >
        <Container
          style={{
            backgroundColor: "#ffffff",
            border: `1px solid ${c.rule}`,
            borderRadius: "6px",
            padding: "20px 24px",
            maxWidth: "620px",
          }}
        >
          <Text style={{ ...small, color: c.accent, fontWeight: 600 }}>Inhibitrack · weekly digest</Text>
          <Heading as="h1" style={{ fontSize: "18px", margin: "4px 0 2px", color: c.ink }}>
            {d.campaign.name}
          </Heading>
          <Text style={small}>
            {d.campaign.targetEnzyme} · {fmtDate(d.from)} to {fmtDate(d.to)} (UTC dates) · for {recipientName}
          </Text>
          <Hr style={{ borderColor: c.rule }} />

          <Heading as="h2" style={h2}>
            Plates
          </Heading>
          <Text style={row}>
            {d.runs.total} plate runs uploaded, {d.runs.accepted} accepted, {d.runs.failedQc} failed QC.{" "}
            <Link href={`${base}/plates`} style={{ color: c.accent }}>
              Open plates
            </Link>
          </Text>
          {d.runs.failed.map((r) => (
            <Text key={r.id} style={small}>
              QC fail:{" "}
              <Link href={`${base}/plates/runs/${r.id}`} style={{ color: c.accent }}>
                {r.fileName}
              </Link>{" "}
              (Z′ {r.zPrime === null ? "undefined" : r.zPrime.toFixed(2)}){r.reason ? ` — ${r.reason}` : ""}
            </Text>
          ))}

          <Heading as="h2" style={h2}>
            New hits ({d.newHits.length})
          </Heading>
          {d.newHits.length === 0 ? <Text style={small}>None this week.</Text> : null}
          {d.newHits.slice(0, 20).map((h) => (
            <Text key={h.compoundId} style={row}>
              <Link href={`${d.appUrl}/compounds/${h.compoundId}`} style={{ color: c.accent }}>
                {h.compoundId}
              </Link>{" "}
              — {h.pctInhibition === null ? "—" : `${h.pctInhibition.toFixed(1)} % inhibition`}
            </Text>
          ))}
          {d.newHits.length > 20 ? <Text style={small}>and {d.newHits.length - 20} more in the app.</Text> : null}

          <Heading as="h2" style={h2}>
            New or changed Ki values and mechanism calls ({d.mechanismCalls.length})
          </Heading>
          {d.mechanismCalls.length === 0 ? <Text style={small}>None this week.</Text> : null}
          {d.mechanismCalls.slice(0, 20).map((m) => (
            <Text key={`${m.experimentId}-${m.compoundId}`} style={row}>
              <Link href={`${base}/analyses/${m.experimentId}/${m.compoundId}`} style={{ color: c.accent }}>
                {m.compoundId}
              </Link>{" "}
              — {m.mechanism ?? "no call"}
              {m.label === "ambiguous" || m.label === "inadequate" ? ` (${m.label})` : ""}, Ki{" "}
              {formatConcentration(m.kiUm)}
              {m.label === "inadequate" && m.note ? (
                <span style={{ display: "block", color: c.warn, fontSize: "12px" }}>{m.note}</span>
              ) : null}
            </Text>
          ))}

          <Heading as="h2" style={h2}>
            Triage decisions ({d.triage.length})
          </Heading>
          {d.triage.length === 0 ? <Text style={small}>None this week.</Text> : null}
          {d.triage.slice(0, 20).map((t, k) => (
            <Text key={k} style={row}>
              <Link href={`${base}/hits`} style={{ color: c.accent }}>
                {t.compoundId}
              </Link>{" "}
              — {t.detail} {t.by ? `(by ${t.by})` : ""}
            </Text>
          ))}

          <Heading as="h2" style={h2}>
            Top ten by Ki
          </Heading>
          {d.topTen.length === 0 ? <Text style={small}>No Ki values yet.</Text> : null}
          {d.topTen.map((t, k) => (
            <Text key={t.compoundId} style={row}>
              {k + 1}.{" "}
              <Link href={`${d.appUrl}/compounds/${t.compoundId}`} style={{ color: c.accent }}>
                {t.compoundId}
              </Link>{" "}
              — Ki {formatConcentration(t.kiUm)}
              {t.mechanism ? `, ${t.mechanism}` : ""}
              {t.ic50Um !== null ? `, IC50 ${formatConcentration(t.ic50Um)}` : ""}
              {t.inadequate
                ? ` (inadequate). ${t.note ?? "Review the fit."}`
                : t.flagged
                  ? " (flagged: review the fit)"
                  : ""}
            </Text>
          ))}

          <Heading as="h2" style={h2}>
            Registry
          </Heading>
          <Text style={row}>
            {d.compoundsRegisteredTotal} compounds registered this week
            {d.compoundsRegistered.length
              ? `: ${d.compoundsRegistered.map((x) => x.registryId).join(", ")}${d.compoundsRegisteredTotal > d.compoundsRegistered.length ? ", …" : ""}`
              : "."}
          </Text>

          <Hr style={{ borderColor: c.rule, marginTop: "20px" }} />
          <Section>
            <Text style={small}>
              Research use only: potency and mechanism calls depend on assay conditions and must be reviewed by a
              qualified scientist before decisions.
            </Text>
            <Text style={small}>
              You get this because you are a member of {d.campaign.name}.{" "}
              <Link href={optOutUrl} style={{ color: c.muted }}>
                Stop the weekly digest for this campaign
              </Link>
              .
            </Text>
          </Section>
        </Container>
      </Body>
    </Html>
  );
}
