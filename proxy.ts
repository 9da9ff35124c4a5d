import { NextResponse, type NextRequest } from "next/server";

/**
 * Passes the requested path to pages (so sign-in can come back to it). Not a guard:
 * every page, action and route handler checks the actor itself.
 */
export function proxy(request: NextRequest) {
  const headers = new Headers(request.headers);
  headers.set("x-zw-path", request.nextUrl.pathname + request.nextUrl.search);
  return NextResponse.next({ request: { headers } });
}

export const config = {
  matcher: ["/((?!_next/static|_next/image|icon.svg|logo-mark.svg|favicon.ico).*)"],
};
