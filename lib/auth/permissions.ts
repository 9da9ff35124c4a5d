import type { Role } from "@/db/schema/users";

/**
 * Which role may do what: one table of data, read by every page, action and route handler
 * through can(). The UI hiding a button is a convenience; this is the check.
 */
export const permissionTable = {
  "tester.home": ["tester"],
  "credentials.manage": ["tester"],
  "reports.file": ["tester"],
  "reports.read_own": ["tester"],
  "assemblies.search": ["tester", "inspector", "admin"],
  "assemblies.register": ["tester"],
  "tags.print": ["tester", "inspector", "admin"],
  "fees.pay": ["tester"],
  /** Also needs users.is_billing_manager: the company's billing manager pays and sees every colleague's fees. */
  "fees.pay_company": ["tester"],
  "reports.review": ["inspector", "admin"],
  "reports.read_program": ["inspector", "admin"],
  "inventory.view": ["inspector", "admin"],
  "inventory.manage": ["inspector", "admin"],
  "inventory.import": ["inspector", "admin"],
  "compliance.view": ["inspector", "admin"],
  "testers.review": ["inspector", "admin"],
  "notices.view": ["inspector", "admin"],
  "notices.run": ["admin"],
  "summary.view": ["inspector", "admin"],
  "certificates.reissue": ["inspector", "admin"],
  "settings.manage": ["admin"],
  "users.manage": ["admin"],
  "audit.view": ["admin"],
  "mailbox.view": ["admin"],
  "fees.manage": ["admin"],
  "owner.portal": ["owner"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof permissionTable;

export interface Actor {
  id: number;
  role: Role;
  name: string;
  email: string;
  /** Set for inspectors and admins: the one program they work for. */
  programId: number | null;
  companyId: number | null;
  isBillingManager: boolean;
}

export function can(actor: Pick<Actor, "role"> | null | undefined, permission: Permission): boolean {
  if (!actor) return false;
  return (permissionTable[permission] as readonly Role[]).includes(actor.role);
}

export class PermissionError extends Error {
  constructor(public readonly permission: Permission) {
    super(`Not allowed: ${permission}`);
    this.name = "PermissionError";
  }
}

export function assertCan(actor: Actor | null, permission: Permission): asserts actor is Actor {
  if (!can(actor, permission)) throw new PermissionError(permission);
}

/** Staff rows are scoped to one program; throws when the actor has none (a data error, not input). */
export function staffProgramId(actor: Actor): number {
  if (actor.programId === null) throw new PermissionError("reports.read_program");
  return actor.programId;
}
