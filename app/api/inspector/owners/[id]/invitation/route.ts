// POST /api/inspector/owners/:id/invitation: invites an owner to the owner portal (or links their existing account).
import { z } from "zod";
import { inviteOwner } from "@/lib/data/users-admin";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const POST = apiRoute({ permission: "inventory.manage" }, async ({ actor, params }) => inviteOwner(actor, parseOrThrow(z.coerce.number().int().positive("No such owner."), params.id)));
