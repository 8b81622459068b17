import { NextResponse, type NextRequest } from "next/server";
import { hasRole } from "@/lib/roles";
import { auth } from "@/server/auth";

/**
 * Sends people who cannot use the lab area elsewhere before any lab page renders. A convenience
 * only: every lab page, route handler and server action checks the role again on the server.
 */
export async function proxy(request: NextRequest) {
  const session = await auth();
  const role = session?.user?.role;
  if (!role) {
    const signIn = new URL("/sign-in", request.nextUrl);
    signIn.searchParams.set("callbackUrl", request.nextUrl.pathname + request.nextUrl.search);
    return NextResponse.redirect(signIn);
  }
  if (!hasRole(role, "host")) return NextResponse.redirect(new URL("/forbidden?needs=host", request.nextUrl));
  return NextResponse.next();
}

export const config = { matcher: ["/lab", "/lab/:path*"] };
