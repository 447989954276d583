import { NextResponse } from "next/server";
import { STAFF_ROLES } from "@/db/schema";
import { route } from "@/lib/http";

/**
 * Keep-alive from the idle timer in the app shell: a staff member who is working on one page (a long video visit)
 * without other requests still counts as active. The guard inside `route` records the activity.
 */
export const POST = route(STAFF_ROLES, async () => new NextResponse(null, { status: 204 }));
