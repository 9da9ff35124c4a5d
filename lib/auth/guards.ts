import "server-only";
import { forbidden } from "next/navigation";
import { can, type Actor, type Permission } from "./permissions";
import { requireActor } from "./session";

/** For pages: signed in (else to sign-in) and allowed (else 403). Layouts are not guards. */
export async function requirePermission(permission: Permission): Promise<Actor> {
  const actor = await requireActor();
  if (!can(actor, permission)) forbidden();
  return actor;
}

export function homePathFor(actor: Pick<Actor, "role">): string {
  switch (actor.role) {
    case "tester":
      return "/tester";
    case "inspector":
      return "/inspector";
    case "admin":
      return "/admin";
    case "owner":
      return "/owner";
  }
}
