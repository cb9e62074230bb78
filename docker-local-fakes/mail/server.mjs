#!/usr/bin/env node
// A local stand-in for the Resend e-mail API. It accepts what the resend SDK sends
// (POST /emails, POST /emails/batch, GET /emails/:id), honours Idempotency-Key like the
// real service (same key → same message, nothing new stored), keeps every message on disk,
// and shows the outbox as JSON at GET /__outbox and as a page at GET /.
// Usage: node docker-local-fakes/mail/server.mjs --port 4025 --dir .local/mail
import http from "node:http";
import fs from "node:fs";
import path from "node:path";
import crypto from "node:crypto";

const args = Object.fromEntries(
  process.argv.slice(2).reduce((acc, a, i, all) => (a.startsWith("--") ? [...acc, [a.slice(2), all[i + 1]]] : acc), []),
);
const port = Number(args.port ?? process.env.MAIL_FAKE_PORT ?? 4025);
const host = args.host ?? "127.0.0.1";
const dir = path.resolve(args.dir ?? process.env.MAIL_FAKE_DIR ?? ".local/mail");
fs.mkdirSync(dir, { recursive: true });

const idemFile = path.join(dir, "idempotency.json");
/** @type {Record<string, string>} */
let idempotency = {};
try {
  idempotency = JSON.parse(fs.readFileSync(idemFile, "utf8"));
} catch {
  idempotency = {};
}

function listMessages() {
  return fs
    .readdirSync(dir)
    .filter((f) => f.startsWith("msg-") && f.endsWith(".json"))
    .map((f) => JSON.parse(fs.readFileSync(path.join(dir, f), "utf8")))
    .sort((a, b) => (a.created_at < b.created_at ? -1 : a.created_at > b.created_at ? 1 : a.seq - b.seq));
}

let seq = listMessages().length;

function store(body, idemKey) {
  if (idemKey && idempotency[idemKey]) return { id: idempotency[idemKey], duplicate: true };
  const id = crypto.randomUUID();
  seq += 1;
  const msg = {
    id,
    seq,
    created_at: new Date().toISOString(),
    idempotency_key: idemKey ?? null,
    from: body.from,
    to: Array.isArray(body.to) ? body.to : [body.to],
    cc: body.cc ?? null,
    bcc: body.bcc ?? null,
    reply_to: body.reply_to ?? body.replyTo ?? null,
    subject: body.subject,
    html: body.html ?? null,
    text: body.text ?? null,
    headers: body.headers ?? null,
    tags: body.tags ?? null,
  };
  fs.writeFileSync(path.join(dir, `msg-${String(seq).padStart(6, "0")}-${id}.json`), JSON.stringify(msg, null, 2));
  if (idemKey) {
    idempotency[idemKey] = id;
    fs.writeFileSync(idemFile, JSON.stringify(idempotency));
  }
  return { id, duplicate: false };
}

function validate(body) {
  if (!body || typeof body !== "object") return "The request body must be a JSON object.";
  if (!body.from) return "Missing `from` field.";
  if (!body.to || (Array.isArray(body.to) && body.to.length === 0)) return "Missing `to` field.";
  if (!body.subject) return "Missing `subject` field.";
  if (!body.html && !body.text && !body.react) return "Missing `html` or `text` field.";
  return null;
}

function send(res, status, obj, type = "application/json") {
  const payload = type === "application/json" ? JSON.stringify(obj) : obj;
  res.writeHead(status, { "content-type": type });
  res.end(payload);
}

const esc = (s) =>
  String(s ?? "").replace(
    /[&<>"']/g,
    (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c],
  );

function page(messages) {
  const rows = messages
    .slice()
    .reverse()
    .map(
      (m) =>
        `<tr><td>${esc(m.created_at.replace("T", " ").slice(0, 19))}</td><td>${esc(m.to.join(", "))}</td><td><a href="/__outbox/${esc(m.id)}/html">${esc(m.subject)}</a></td><td><a href="/__outbox/${esc(m.id)}">json</a></td></tr>`,
    )
    .join("");
  return `<!doctype html><html><head><meta charset="utf-8"><title>Local outbox</title>
<style>body{font:14px/1.4 system-ui,sans-serif;margin:24px;color:#1f2933}table{border-collapse:collapse;width:100%}td,th{border-bottom:1px solid #e4e7eb;padding:6px 8px;text-align:left}th{font-weight:600;color:#52606d}</style></head>
<body><h1 style="font-size:18px">Local outbox — ${messages.length} message(s)</h1>
<p style="color:#52606d">A stand-in for the e-mail service in development and tests. Nothing here left this machine.</p>
<table><thead><tr><th>Received (UTC)</th><th>To</th><th>Subject</th><th></th></tr></thead><tbody>${rows}</tbody></table></body></html>`;
}

const server = http.createServer((req, res) => {
  const url = new URL(req.url ?? "/", `http://${host}:${port}`);
  let raw = "";
  req.on("data", (c) => {
    raw += c;
    if (raw.length > 10 * 1024 * 1024) req.destroy();
  });
  req.on("end", () => {
    try {
      if (req.method === "GET" && url.pathname === "/")
        return send(res, 200, page(listMessages()), "text/html; charset=utf-8");
      if (req.method === "GET" && url.pathname === "/health") return send(res, 200, { ok: true });
      if (req.method === "GET" && url.pathname === "/__outbox") return send(res, 200, { data: listMessages() });
      if (req.method === "DELETE" && url.pathname === "/__outbox") {
        for (const f of fs.readdirSync(dir)) fs.rmSync(path.join(dir, f));
        idempotency = {};
        seq = 0;
        return send(res, 200, { ok: true });
      }
      const one = url.pathname.match(/^\/__outbox\/([\w-]+)(\/html)?$/);
      if (req.method === "GET" && one) {
        const m = listMessages().find((x) => x.id === one[1]);
        if (!m) return send(res, 404, { name: "not_found", message: "No such message." });
        if (one[2]) return send(res, 200, m.html ?? `<pre>${esc(m.text)}</pre>`, "text/html; charset=utf-8");
        return send(res, 200, m);
      }
      const auth = req.headers.authorization ?? "";
      if (!auth.startsWith("Bearer ") || auth.length < 10) {
        return send(res, 401, {
          statusCode: 401,
          name: "missing_api_key",
          message: "Missing API key in the authorization header.",
        });
      }
      if (req.method === "POST" && (url.pathname === "/emails" || url.pathname === "/emails/batch")) {
        let body;
        try {
          body = JSON.parse(raw || "null");
        } catch {
          return send(res, 422, { statusCode: 422, name: "validation_error", message: "Body is not valid JSON." });
        }
        const idem = req.headers["idempotency-key"];
        const key = Array.isArray(idem) ? idem[0] : idem;
        if (url.pathname === "/emails/batch") {
          if (!Array.isArray(body))
            return send(res, 422, {
              statusCode: 422,
              name: "validation_error",
              message: "Batch body must be an array.",
            });
          for (const b of body) {
            const err = validate(b);
            if (err) return send(res, 422, { statusCode: 422, name: "validation_error", message: err });
          }
          const data = body.map((b, i) => ({ id: store(b, key ? `${key}#${i}` : undefined).id }));
          return send(res, 200, { data });
        }
        const err = validate(body);
        if (err) return send(res, 422, { statusCode: 422, name: "validation_error", message: err });
        const { id } = store(body, key);
        return send(res, 200, { id });
      }
      const got = url.pathname.match(/^\/emails\/([\w-]+)$/);
      if (req.method === "GET" && got) {
        const m = listMessages().find((x) => x.id === got[1]);
        if (!m) return send(res, 404, { statusCode: 404, name: "not_found", message: "Email not found" });
        return send(res, 200, { object: "email", ...m, last_event: "delivered" });
      }
      return send(res, 404, {
        statusCode: 404,
        name: "not_found",
        message: "Route not found in the local e-mail fake.",
      });
    } catch (e) {
      console.error(e);
      return send(res, 500, { statusCode: 500, name: "application_error", message: "The local e-mail fake failed." });
    }
  });
});

server.listen(port, host, () => {
  console.log(`mail fake listening on http://${host}:${port} (outbox in ${dir})`);
});
for (const sig of ["SIGINT", "SIGTERM"]) process.on(sig, () => server.close(() => process.exit(0)));
