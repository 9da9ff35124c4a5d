// Access entries for the filing-fee pages and route handlers (see routes.ts for the helpers).
import { apiFor, pageFor, type RouteEntry } from "./routes";

const missing = { anon: 401, tester: 404, inspector: 403, admin: 403, owner: 403 } as const;

export const feesRoutes: RouteEntry[] = [
  { route: "/tester/fees", method: "GET", expect: pageFor("tester") },
  { route: "/tester/fees/return", path: "/tester/fees/return?payment=999999", method: "GET", expect: { anon: 307, tester: 404, inspector: 403, admin: 403, owner: 403 } },
  { route: "/tester/fees/receipts", method: "GET", expect: pageFor("tester") },
  // The demo tester is their company's billing manager.
  { route: "/tester/fees/statement", method: "GET", expect: pageFor("tester") },
  { route: "/admin/fees", method: "GET", expect: pageFor("admin") },
  { route: "/api/fees/checkout", method: "POST", expect: apiFor("tester") },
  // Public, but nothing without a valid signature.
  { route: "/api/fees/webhook", method: "POST", expect: { anon: 400, tester: 400, inspector: 400, admin: 400, owner: 400 } },
  { route: "/api/fees/payments/[id]", path: "/api/fees/payments/999999", method: "GET", expect: missing },
  { route: "/api/fees/payments/[id]/cancel", path: "/api/fees/payments/999999/cancel", method: "POST", expect: missing },
  { route: "/api/fees/reports/[id]/waive", path: "/api/fees/reports/999999/waive", method: "POST", expect: apiFor("admin") },
  { route: "/api/fees/reports/[id]/refund", path: "/api/fees/reports/999999/refund", method: "POST", expect: apiFor("admin") },
  { route: "/api/fees/statements/[companyId]", path: "/api/fees/statements/1?month=2026-01", method: "GET", expect: { anon: 401, tester: 200, inspector: 403, admin: 200, owner: 403 } },
];
