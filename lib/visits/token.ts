import { AccessToken } from "livekit-server-sdk";
import type { Visit } from "@/db/schema";
import type { Actor } from "@/lib/auth/guard";
import { env } from "@/lib/env";
import { roomNameFor } from "./lifecycle";

/** Tokens live 10 minutes: long enough to connect; livekit-client renews them over the open connection. */
export const TOKEN_TTL_S = 10 * 60;

/** A video token for one visit's room; the identity comes from the session, never from the request. */
export async function visitToken(actor: Actor, visit: Visit): Promise<{ token: string; url: string; room: string; identity: string }> {
  const e = env();
  const room = roomNameFor(visit.id);
  const identity = `${actor.role === "client" ? "client" : "staff"}:${actor.userId}`;
  const at = new AccessToken(e.LIVEKIT_API_KEY, e.LIVEKIT_API_SECRET, {
    identity,
    name: actor.name,
    ttl: TOKEN_TTL_S,
    metadata: JSON.stringify({ role: actor.role, visitId: visit.id }),
  });
  at.addGrant({ roomJoin: true, room, canPublish: true, canSubscribe: true, canPublishData: true });
  return { token: await at.toJwt(), url: e.LIVEKIT_URL, room, identity };
}
