import { pageAdmin } from "@/server/auth/page-guard";

export default async function AdminLayout({ children }: { children: React.ReactNode }) {
  await pageAdmin();
  return <>{children}</>;
}
