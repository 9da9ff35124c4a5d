// Access entries for the owner's pages and route handlers (see routes.ts for the helpers).
import type { RouteEntry } from "./routes";

export const ownerRoutes: RouteEntry[] = [];
