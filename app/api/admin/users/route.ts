// POST /api/admin/users: invites an inspector or admin to the program (re-sends a pending invitation).
import { inviteStaff, staffInviteSchema } from "@/lib/data/users-admin";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: "users.manage", body: staffInviteSchema, maxBodyBytes: 4 * 1024 }, async ({ actor, body }) => inviteStaff(actor, body));
