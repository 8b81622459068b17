/**
 * Proofbay's roles, lowest to highest. Each role can do everything the ones before it can,
 * so a gate names the lowest role it admits. "visitor" means not signed in and "member" is a
 * supporter with an active Filament Club membership (derived, never stored).
 */
export const roles = ["visitor", "supporter", "member", "host", "admin"] as const;
export type Role = (typeof roles)[number];

export function roleRank(role: Role): number {
  return roles.indexOf(role);
}

export function hasRole(actual: Role, required: Role): boolean {
  return roleRank(actual) >= roleRank(required);
}

/** The effective role of a signed-in account from its stored role and membership. */
export function effectiveRole(stored: "supporter" | "host" | "admin", hasActiveMembership: boolean): Role {
  if (stored === "supporter" && hasActiveMembership) return "member";
  return stored;
}

export const roleLabels: Record<Role, string> = {
  visitor: "Visitor",
  supporter: "Supporter",
  member: "Filament Club member",
  host: "Host",
  admin: "Admin",
};

export const shortRoleLabels: Record<Role, string> = {
  visitor: "visitor",
  supporter: "supporter",
  member: "member",
  host: "host",
  admin: "admin",
};
