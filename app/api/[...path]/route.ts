import { NextResponse } from "next/server";

function notFound(request: Request) {
  const { pathname } = new URL(request.url);
  return NextResponse.json({ error: { code: "not_found", message: `No API endpoint at ${pathname}.` } }, { status: 404 });
}

export { notFound as GET, notFound as POST, notFound as PUT, notFound as PATCH, notFound as DELETE };
