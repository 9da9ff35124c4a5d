import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { Card } from "@/components/ui/card";
import { CodeSearch } from "./code-search";

export const metadata: Metadata = { title: "Check a certificate" };

export default async function VerifyPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { code } = await searchParams;
  if (typeof code === "string" && code.trim()) {
    const compact = code.replace(/[\s-]+/g, "").toUpperCase().slice(0, 40);
    redirect(`/verify/${encodeURIComponent(compact || "-")}`);
  }
  return (
    <Card>
      <h1 className="mb-1 text-2xl">Check a compliance certificate</h1>
      <p className="mb-5 text-ink-700">Every backflow compliance certificate carries a verification code and a QR code. Enter the code to see whether the certificate is genuine and still current.</p>
      <CodeSearch />
      <p className="mt-4 text-sm text-ink-600">The check shows the assembly&apos;s kind, the end of its serial number, the town, the program and the dates; never the owner&apos;s name, address or contact details.</p>
    </Card>
  );
}
