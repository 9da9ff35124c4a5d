import { redirect } from "next/navigation";
import { homePathFor } from "@/lib/auth/guards";
import { getActor } from "@/lib/auth/session";

export default async function Home() {
  const actor = await getActor();
  redirect(actor ? homePathFor(actor) : "/login");
}
