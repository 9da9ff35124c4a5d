// Access entries for the tester's pages and route handlers (see routes.ts for the helpers).
import type { RouteEntry } from "./routes";

export const testerRoutes: RouteEntry[] = [];
