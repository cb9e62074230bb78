import { redirect } from "next/navigation";
import { getCurrentSession } from "@/server/auth/session";

export default async function Home() {
  const { user } = await getCurrentSession();
  redirect(user ? "/campaigns" : "/sign-in");
}
