import type { Role } from "@/db/schema/users";

export interface NavItem {
  href: string;
  label: string;
}

/** The menu per role. Only a convenience: each page checks permission itself. */
export const navItems: Record<Role, NavItem[]> = {
  tester: [{ href: "/tester", label: "Home" }],
  inspector: [{ href: "/inspector", label: "Home" }],
  admin: [
    { href: "/admin", label: "Home" },
    { href: "/admin/mailbox", label: "Mailbox" },
  ],
  owner: [{ href: "/owner", label: "My sites" }],
};

export const roleLabels: Record<Role, string> = {
  tester: "Tester",
  inspector: "Inspector",
  admin: "Program admin",
  owner: "Owner",
};
