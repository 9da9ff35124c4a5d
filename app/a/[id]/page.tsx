import { notFound, redirect } from "next/navigation";
import { requireActor } from "@/lib/auth/session";

// The address a tag's QR code holds. Sign-in comes first (and returns here); then each role
// goes where it works with the assembly: a tester straight to a new test for it.
export default async function AssemblyTagTarget({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  if (!/^\d{1,10}$/.test(id)) notFound();
  const actor = await requireActor();
  switch (actor.role) {
    case "tester":
      redirect(`/tester/reports/new?assembly=${id}`);
    case "inspector":
    case "admin":
      redirect(`/inspector/assemblies/${id}`);
    case "owner":
      redirect(`/owner/assemblies/${id}`);
  }
}
