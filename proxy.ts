import { NextResponse, type NextRequest } from "next/server";

// Redirects only: a visitor without a session cookie is sent to sign-in. This is convenience, not security; every
// page, server action and route handler checks the session, role and record itself (lib/auth/guard.ts).
const SESSION_COOKIES = ["authjs.session-token", "__Secure-authjs.session-token"];

export function proxy(request: NextRequest) {
  const hasSession = SESSION_COOKIES.some((name) => request.cookies.has(name));
  if (!hasSession) {
    const url = request.nextUrl.clone();
    url.pathname = "/sign-in";
    url.search = "";
    return NextResponse.redirect(url);
  }
  return NextResponse.next();
}

export const config = {
  matcher: ["/home/:path*", "/clients/:path*", "/team/:path*", "/clinic/:path*", "/audit/:path*", "/visits/:path*", "/consent/:path*", "/practice/:path*"],
};
