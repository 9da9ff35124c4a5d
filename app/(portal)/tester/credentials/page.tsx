import type { Metadata } from "next";
import { CredentialsManager } from "@/components/tester/credentials-manager";
import { PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listMyCredentials } from "@/lib/data/tester-credentials";

export const metadata: Metadata = { title: "Credentials and kits" };

export default async function CredentialsPage() {
  const actor = await requirePermission("credentials.manage");
  const credentials = await listMyCredentials(actor);
  return (
    <div className="mx-auto max-w-4xl">
      <PageHeader title="Credentials and kits" description="Your certification and each test kit with its latest accuracy check. An expired certification or a kit not checked within a year on the test date keeps a report from being filed." />
      <CredentialsManager initial={credentials} />
    </div>
  );
}
