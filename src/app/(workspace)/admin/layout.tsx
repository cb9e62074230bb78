import { notFound } from "next/navigation";
import { requireUser } from "@/server/auth/guard";

export default async function AdminLayout({ children }: { children: React.ReactNode }) {
  const user = await requireUser();
  if (user.globalRole !== "admin") notFound();
  return <>{children}</>;
}
