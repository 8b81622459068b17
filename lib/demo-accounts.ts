/** The seeded one-account-per-role logins offered for one-click sign-in in demo mode only. */
export const demoAccountEmails = [
  "owner@harbor-street.example",
  "host@harbor-street.example",
  "member@harbor-street.example",
  "supporter@harbor-street.example",
] as const;
