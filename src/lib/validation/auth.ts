import { z } from "zod";
import { campaignRoles } from "@/lib/roles";

export const email = z.string().trim().toLowerCase().email("Enter a valid e-mail address.").max(254);
export const newPassword = z.string().min(10, "Use at least 10 characters.").max(200, "Use at most 200 characters.");

export const signInSchema = z.object({
  email,
  password: z.string().min(1, "Enter your password.").max(200),
  next: z.string().optional(),
});
export const resetRequestSchema = z.object({ email });
export const resetSchema = z.object({ token: z.string().min(20), password: newPassword });
export const acceptInviteSchema = z.object({
  token: z.string().min(20),
  name: z.string().trim().min(1, "Enter your name.").max(120).optional(),
  password: z.string().max(200),
});
export const changePasswordSchema = z.object({
  current: z.string().min(1, "Enter your current password."),
  password: newPassword,
});

const optNum = z.preprocess(
  (v) => (v === "" || v === null || v === undefined ? undefined : v),
  z.coerce.number().finite().positive().optional(),
);

export const campaignSchema = z.object({
  name: z.string().trim().min(1, "Name the campaign.").max(120),
  targetEnzyme: z.string().trim().min(1, "Name the target enzyme.").max(120),
  substrate: z.string().trim().max(120).optional(),
  kmValue: optNum,
  kmUnit: z.enum(["nM", "µM", "mM"]).default("µM"),
  enzymeConcValue: optNum,
  enzymeConcUnit: z.enum(["pM", "nM", "µM"]).default("nM"),
  assayNotes: z.string().trim().max(4000).optional(),
  qcMinZPrime: z.coerce.number().min(-1).max(1).default(0.5),
  qcMaxCvPct: z.coerce.number().positive().max(100).default(20),
  timeZone: z.string().trim().max(64).default("UTC"),
});

export const roleSchema = z.enum(campaignRoles);
export const inviteSchema = z.object({ campaignId: z.string().uuid(), email, role: roleSchema });
export const memberRoleSchema = z.object({
  campaignId: z.string().uuid(),
  userId: z.string().min(1),
  role: roleSchema,
});
export const removeMemberSchema = z.object({ campaignId: z.string().uuid(), userId: z.string().min(1) });
