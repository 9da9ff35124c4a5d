/** The demo's sign-in accounts; all share one password. Demo data only. */
export const DEMO_PASSWORD = "zoneward-demo";

export const demoAccounts = {
  admin: "admin@quillmere-water.example",
  inspector: "inspector@quillmere-water.example",
  inspector2: "m.rookwood@quillmere-water.example",
  inspector3: "s.emberly@quillmere-water.example",
  neighbourAdmin: "admin@tansyridge-water.example",
  neighbourInspector: "inspector@tansyridge-water.example",
  tester: "tester@quillfeather-testing.example",
  testerExpired: "expired.tester@marrowdale-plumbing.example",
  testerPending: "new.tester@ironquill-mechanical.example",
  owner: "owner@quillmere-demo.example",
} as const;

export function demoAccountEmails(): string[] {
  return Object.values(demoAccounts);
}
