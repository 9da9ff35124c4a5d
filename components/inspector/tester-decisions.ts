// Which decisions a registration in each state can take (the data layer enforces the same transitions).

export type TesterStatus = "pending" | "approved" | "rejected" | "suspended";

export function decisionsFor(status: TesterStatus): ("approve" | "reject" | "suspend" | "reinstate")[] {
  switch (status) {
    case "pending":
      return ["approve", "reject"];
    case "approved":
      return ["suspend"];
    case "suspended":
      return ["reinstate"];
    case "rejected":
      return ["approve"];
  }
}
