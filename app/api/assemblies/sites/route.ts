// GET /api/assemblies/sites?q=…&program=…: sites by account number, street address or name, to register a new assembly at.
import { assemblySearchSchema, searchSites } from "@/lib/data/assemblies-search";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "assemblies.search" }, async ({ actor, searchParams }) => {
  const input = parseOrThrow(assemblySearchSchema, { q: searchParams.get("q") ?? "", program: searchParams.get("program") || undefined });
  return searchSites(actor, input);
});
