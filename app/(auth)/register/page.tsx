import type { Metadata } from "next";
import { Card } from "@/components/ui/card";
import { listPublicPrograms } from "@/lib/data/accounts";
import { RegisterForm } from "./_components/register-form";

export const metadata: Metadata = { title: "Register as a tester" };
export const dynamic = "force-dynamic";

export default async function RegisterPage() {
  const programs = await listPublicPrograms();
  return (
    <Card>
      <h1 className="mb-1 text-2xl">Register as a certified tester</h1>
      <p className="mb-5 text-ink-600">One account for every program you test in. Already registered? <a href="/login">Sign in</a>.</p>
      <RegisterForm programs={programs} />
    </Card>
  );
}
