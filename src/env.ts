import { z } from "zod";
// Relative, not "@/…": next.config.ts loads this file through a transpiler that does not resolve the alias.
import { DEFAULT_REGISTRY_PREFIX, REGISTRY_PREFIX_RE } from "./lib/registry-id";

/**
 * The environment, parsed once. A bad value fails `next build` and the first server import with
 * a message naming the variable, instead of failing later in a request.
 */
const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z.string().url().optional(),
  APP_URL: z.string().url().default("http://127.0.0.1:3000"),
  /** "1" loads the invented demo campaign and its demo accounts when the database is empty. */
  DEMO_DATA: z.enum(["0", "1"]).default("0"),
  /** "production" refuses demo accounts and demo data whatever DEMO_DATA says. */
  INHIBITRACK_MODE: z.enum(["local", "production"]).default("local"),
  S3_ENDPOINT: z.string().url().optional(),
  S3_REGION: z.string().default("us-east-1"),
  S3_BUCKET: z.string().default("inhibitrack-raw"),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  RESEND_API_KEY: z.string().optional(),
  RESEND_BASE_URL: z.string().url().optional(),
  MAIL_FROM: z.string().default("Inhibitrack <no-reply@inhibitrack.invalid>"),
  /**
   * Secret for signed links (digest opt-out). Required in production mode; elsewhere a random one
   * is made once per installation and kept in .local/link-secret.
   */
  LINK_SIGNING_SECRET: z.string().min(16).optional(),
  /**
   * Comma-separated addresses or CIDR ranges of the reverse proxies in front of the app. Only a
   * request whose peer is one of them has its X-Forwarded-For read (the right-most hop that is not
   * a listed proxy); otherwise the peer's own address counts. Empty: no proxy is trusted.
   */
  TRUSTED_PROXIES: z
    .string()
    .default("")
    .transform((v) =>
      v
        .split(",")
        .map((s) => s.trim())
        .filter(Boolean),
    )
    .pipe(
      z.array(
        z
          .string()
          .regex(
            /^(?:\d{1,3}(?:\.\d{1,3}){3}(?:\/\d{1,2})?|[0-9a-fA-F:]*:[0-9a-fA-F:.]*(?:\/\d{1,3})?)$/,
            "TRUSTED_PROXIES must list IP addresses or CIDR ranges, separated by commas",
          ),
      ),
    ),
  REGISTRY_PREFIX: z
    .string()
    .regex(REGISTRY_PREFIX_RE, "REGISTRY_PREFIX must look like INH-")
    .default(DEFAULT_REGISTRY_PREFIX),
});

const parsed = schema.safeParse(process.env);
if (!parsed.success) {
  const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`).join("\n");
  throw new Error(`Invalid environment:\n${lines}`);
}
export const env = parsed.data;
export type Env = typeof env;
