import "server-only";
import crypto from "node:crypto";
import type { Db } from "@/server/db/client";
import { users, campaigns, memberships, auditLog } from "@/server/db/schema";
import { hashPassword } from "@/server/auth/password";

/** The demo password of every invented demo account (printed by `npm start`, in the README). */
export const DEMO_PASSWORD = "inhibitrack-demo";

/**
 * Invented people and campaigns for the demo (not real people, not a real project). The enzyme
 * "vetrase-2" and the protease "kelpin" are fictional targets.
 */
export const demoPeople = [
  { email: "admin@example.org", name: "Ada Okafor (demo admin)", globalRole: "admin" as const },
  { email: "lead@example.org", name: "Lars Brenner (demo lead)", globalRole: "member" as const },
  { email: "chemist@example.org", name: "Chiara Mendes (demo chemist)", globalRole: "member" as const },
  { email: "assay@example.org", name: "Aiko Sato (demo assay scientist)", globalRole: "member" as const },
  { email: "viewer@example.org", name: "Vik Patel (demo viewer, partner lab)", globalRole: "member" as const },
];

export async function seedAccounts(db: Db) {
  const hash = await hashPassword(DEMO_PASSWORD);
  const ids: Record<string, string> = {};
  for (const p of demoPeople) {
    const id = crypto.randomUUID();
    ids[p.email] = id;
    await db.insert(users).values({ id, email: p.email, name: p.name, globalRole: p.globalRole, passwordHash: hash });
  }
  const [main] = await db
    .insert(campaigns)
    .values({
      name: "Vetrase-2 hit finding (invented demo)",
      targetEnzyme: "Vetrase-2 (fictional hydrolase)",
      substrate: "VZ-AMC fluorogenic peptide (fictional)",
      kmValue: 20,
      kmUnit: "µM",
      enzymeConcValue: 10,
      enzymeConcUnit: "nM",
      assayNotes:
        "Invented demo campaign. 384-well, 20 µL, 30 min at 25 °C, fluorescence ex 360 / em 460 nm. Neutral control: enzyme + substrate + 1 % DMSO; full-inhibition control: no enzyme.",
      createdBy: ids["admin@example.org"],
    })
    .returning();
  const [second] = await db
    .insert(campaigns)
    .values({
      name: "Kelpin protease follow-up (invented demo)",
      targetEnzyme: "Kelpin (fictional serine protease)",
      substrate: "KP-pNA chromogenic peptide (fictional)",
      kmValue: 85,
      kmUnit: "µM",
      assayNotes: "Invented demo campaign. 96-well absorbance at 405 nm, kinetic read.",
      createdBy: ids["admin@example.org"],
    })
    .returning();
  const m = (c: string, e: string, role: "lead" | "chemist" | "assay" | "viewer") => ({
    campaignId: c,
    userId: ids[e]!,
    role,
  });
  await db
    .insert(memberships)
    .values([
      m(main!.id, "lead@example.org", "lead"),
      m(main!.id, "chemist@example.org", "chemist"),
      m(main!.id, "assay@example.org", "assay"),
      m(main!.id, "viewer@example.org", "viewer"),
      m(second!.id, "lead@example.org", "lead"),
      m(second!.id, "chemist@example.org", "chemist"),
      m(second!.id, "assay@example.org", "assay"),
    ]);
  await db.insert(auditLog).values([
    {
      actorId: ids["admin@example.org"],
      actorEmail: "admin@example.org",
      campaignId: main!.id,
      action: "campaign.create",
      entityType: "campaign",
      entityId: main!.id,
      reason: "demo data",
    },
    {
      actorId: ids["admin@example.org"],
      actorEmail: "admin@example.org",
      campaignId: second!.id,
      action: "campaign.create",
      entityType: "campaign",
      entityId: second!.id,
      reason: "demo data",
    },
  ]);
  return { userIds: ids, mainCampaignId: main!.id, secondCampaignId: second!.id };
}
