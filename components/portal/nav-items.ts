import type { Role } from "@/db/schema/users";

export interface NavItem {
  href: string;
  label: string;
}

/** The menu per role. Only a convenience: each page checks permission itself. */
export const navItems: Record<Role, NavItem[]> = {
  tester: [
    { href: "/tester", label: "Home" },
    { href: "/tester/assemblies", label: "Find assembly" },
    { href: "/tester/reports", label: "My reports" },
    { href: "/tester/coming-due", label: "Coming due" },
    { href: "/tester/credentials", label: "Credentials & kits" },
    { href: "/tester/fees", label: "Fees" },
  ],
  inspector: [
    { href: "/inspector", label: "Home" },
    { href: "/inspector/reports", label: "Review queue" },
    { href: "/inspector/inventory", label: "Inventory" },
    { href: "/inspector/compliance", label: "Compliance" },
    { href: "/inspector/notices", label: "Notices" },
    { href: "/inspector/testers", label: "Testers" },
    { href: "/inspector/summary", label: "Summary" },
  ],
  admin: [
    { href: "/admin", label: "Home" },
    { href: "/inspector", label: "Program" },
    { href: "/inspector/notices", label: "Notices" },
    { href: "/admin/settings", label: "Settings" },
    { href: "/admin/users", label: "Users" },
    { href: "/admin/audit", label: "Audit log" },
    { href: "/admin/mailbox", label: "Mailbox" },
    { href: "/admin/fees", label: "Fees" },
  ],
  owner: [
    { href: "/owner", label: "My sites" },
    { href: "/testers", label: "Find a tester" },
    { href: "/verify", label: "Check a certificate" },
  ],
};

export const roleLabels: Record<Role, string> = {
  tester: "Tester",
  inspector: "Inspector",
  admin: "Program admin",
  owner: "Owner",
};
