// PATCH /api/admin/users/:id: disables or re-enables a staff account, or changes inspector ↔ admin.
import { z } from "zod";
import { changeStaff, staffChangeSchema } from "@/lib/data/users-admin";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const PATCH = apiRoute({ permission: "users.manage", body: staffChangeSchema, maxBodyBytes: 4 * 1024 }, async ({ actor, body, params }) => {
  await changeStaff(actor, parseOrThrow(z.coerce.number().int().positive("No such user."), params.id), body);
  return { ok: true };
});
