// GET /api/assemblies/search?q=…&program=…: assemblies by serial, account number, street address or site name (prefix, as-you-type).
import { assemblySearchSchema, searchAssemblies } from "@/lib/data/assemblies-search";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "assemblies.search" }, async ({ actor, searchParams }) => {
  const input = parseOrThrow(assemblySearchSchema, { q: searchParams.get("q") ?? "", program: searchParams.get("program") || undefined });
  return searchAssemblies(actor, input);
});
