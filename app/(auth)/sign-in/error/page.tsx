import type { Metadata } from "next";
import { LinkProblem, type LinkProblemReason } from "../link-problem";

export const metadata: Metadata = { title: "Sign-in problem", robots: { index: false } };

const byAuthError: Record<string, LinkProblemReason> = {
  Verification: "expired",
  AccessDenied: "denied",
  Configuration: "unavailable",
};

export default async function SignInErrorPage({ searchParams }: { searchParams: Promise<{ error?: string }> }) {
  const { error } = await searchParams;
  return <LinkProblem reason={byAuthError[error ?? ""] ?? "expired"} />;
}
