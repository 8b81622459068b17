import "server-only";
import { redirect } from "next/navigation";
import { hasRole, roleLabels, type Role } from "@/lib/roles";
import { getViewer, type Viewer } from "./auth";
import { HttpError } from "./http-error";

/**
 * The server-side gate every route handler and server action calls first. The proxy and hidden
 * buttons are conveniences; this is the check that counts.
 */
export async function requireRole(required: Exclude<Role, "visitor">): Promise<Viewer> {
  const viewer = await getViewer();
  if (!viewer) throw new HttpError(401, "unauthenticated", "Sign in to do this.");
  if (!hasRole(viewer.role, required)) {
    throw new HttpError(403, "forbidden", `This needs the ${roleLabels[required]} role or higher.`);
  }
  return viewer;
}

/** The same gate for pages: sends a visitor to sign in and anyone else without the role away. */
export async function requirePageRole(required: Exclude<Role, "visitor">, returnTo: string): Promise<Viewer> {
  const viewer = await getViewer();
  if (!viewer) redirect(`/sign-in?callbackUrl=${encodeURIComponent(returnTo)}`);
  if (!hasRole(viewer.role, required)) redirect(`/forbidden?needs=${required}`);
  return viewer;
}
