"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { JsonForm, textOf } from "@/components/inspector/json-form";
import { sendJson } from "@/components/inspector/send-json";

export interface StaffMember {
  id: number;
  name: string;
  email: string;
  role: "inspector" | "admin";
  status: "active" | "invited" | "suspended" | "disabled";
  lastSignIn: string;
  invitationExpires: string;
  isSelf: boolean;
}

const statusTone = { active: "pass", invited: "caution", suspended: "fail", disabled: "muted" } as const;

function StaffActions({ member }: { member: StaffMember }) {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  const change = async (body: unknown, confirmText?: string) => {
    if (confirmText && !window.confirm(confirmText)) return;
    const result = await sendJson("PATCH", `/api/admin/users/${member.id}`, body);
    setMessage(result.ok ? null : result.error);
    router.refresh();
  };
  const resend = async () => {
    const result = await sendJson("POST", "/api/admin/users", { name: member.name, email: member.email, role: member.role });
    setMessage(result.ok ? "Invitation sent again." : result.error);
    router.refresh();
  };
  if (member.isSelf) return <span className="text-sm text-ink-600">you</span>;
  return (
    <div className="flex flex-wrap items-center gap-1">
      {member.status === "invited" ? (
        <Button size="sm" variant="secondary" onClick={() => void resend()}>
          Re-send invitation
        </Button>
      ) : null}
      {member.status === "active" ? (
        <Button size="sm" variant="secondary" onClick={() => void change({ role: member.role === "admin" ? "inspector" : "admin" })}>
          {member.role === "admin" ? "Make inspector" : "Make admin"}
        </Button>
      ) : null}
      {member.status === "active" || member.status === "invited" ? (
        <Button size="sm" variant="danger" onClick={() => void change({ status: "disabled" }, `Disable ${member.name}'s account? They are signed out at once.`)}>
          Disable
        </Button>
      ) : (
        <Button size="sm" variant="secondary" onClick={() => void change({ status: "active" })}>
          Enable
        </Button>
      )}
      {message ? (
        <span role="status" className="text-sm">
          {message}
        </span>
      ) : null}
    </div>
  );
}

export function StaffTable({ staff }: { staff: StaffMember[] }) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm">
        <thead className="border-b border-ink-200 text-xs uppercase tracking-wide text-ink-600">
          <tr>
            <th className="py-2 pr-3">Name</th>
            <th className="py-2 pr-3">Role</th>
            <th className="py-2 pr-3">Account</th>
            <th className="py-2 pr-3">Last signed in</th>
            <th className="py-2" />
          </tr>
        </thead>
        <tbody className="divide-y divide-ink-100">
          {staff.map((m) => (
            <tr key={m.id} className="align-top">
              <td className="py-2 pr-3">
                <span className="font-semibold">{m.name}</span>
                <div className="text-xs text-ink-600">{m.email}</div>
              </td>
              <td className="py-2 pr-3">{m.role === "admin" ? "Program admin" : "Inspector"}</td>
              <td className="py-2 pr-3">
                <Badge tone={statusTone[m.status]}>{m.status}</Badge>
                {m.invitationExpires ? <div className="text-xs text-ink-600">link valid until {m.invitationExpires}</div> : null}
              </td>
              <td className="py-2 pr-3">{m.lastSignIn || "—"}</td>
              <td className="py-2">
                <StaffActions member={m} />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function InviteStaffForm() {
  return (
    <JsonForm<{ isResent: boolean }> method="POST" url="/api/admin/users" toBody={(d) => ({ name: textOf(d, "name"), email: textOf(d, "email"), role: textOf(d, "role") })} submitLabel="Send the invitation" successMessage={(d) => (d.isResent ? "Invitation sent again." : "Invited: the set-up link is on its way.")}>
      {(errors) => (
        <div className="grid gap-4 sm:grid-cols-3">
          <TextField id="name" label="Full name" required error={errors.name} maxLength={120} />
          <TextField id="email" label="E-mail address" type="email" required error={errors.email} maxLength={254} />
          <SelectField id="role" label="Role" defaultValue="inspector" error={errors.role}>
            <option value="inspector">Inspector</option>
            <option value="admin">Program admin</option>
          </SelectField>
        </div>
      )}
    </JsonForm>
  );
}

export function OwnerInviteButton({ ownerId, portal }: { ownerId: number; portal: string }) {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  if (portal === "active") return <span className="text-sm text-pass-700">uses the portal</span>;
  return (
    <span className="inline-flex items-center gap-2">
      <Button
        size="sm"
        variant="secondary"
        onClick={() =>
          void sendJson<{ status: string }>("POST", `/api/inspector/owners/${ownerId}/invitation`).then((r) => {
            setMessage(r.ok ? (r.data.status === "linked" ? "linked" : "sent") : r.error);
            router.refresh();
          })
        }
      >
        {portal === "invited" ? "Re-send" : "Invite"}
      </Button>
      {message ? (
        <span role="status" className="text-xs">
          {message}
        </span>
      ) : null}
    </span>
  );
}
