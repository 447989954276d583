import { TokenVerifier } from "livekit-server-sdk";

/** What a verified access token lets its holder do in one room. */
export interface RoomAccess {
  roomName: string;
  identity: string;
  name: string;
  metadata: string;
  attributes: Record<string, string>;
  canPublish: boolean;
  canSubscribe: boolean;
  canPublishData: boolean;
}

/** A token that must not open a room; `message` names the claim at fault and is sent back with the 401. */
export class AccessRefused extends Error {}

export type AccessCheck = (token: string | null) => Promise<RoomAccess>;

export function createAccessCheck(apiKey: string, apiSecret: string): AccessCheck {
  const verifier = new TokenVerifier(apiKey, apiSecret);
  return async (token) => {
    if (!token) throw new AccessRefused("access_token: expected a signed JWT in the query string");
    let claims: Awaited<ReturnType<TokenVerifier["verify"]>>;
    try {
      claims = await verifier.verify(token);
    } catch (error) {
      const reason = error instanceof Error ? error.message : String(error);
      throw new AccessRefused(`access_token: signature, issuer or expiry not accepted (${reason})`);
    }
    const grant = claims.video;
    if (!grant?.roomJoin) throw new AccessRefused("access_token: video grant must have roomJoin: true");
    if (!grant.room) throw new AccessRefused("access_token: video grant must name the room to join");
    if (!claims.sub) throw new AccessRefused("access_token: expected an identity (sub claim)");
    // LiveKit treats an absent permission as granted; a token must say false to withhold it.
    return {
      roomName: grant.room,
      identity: claims.sub,
      name: claims.name ?? "",
      metadata: claims.metadata ?? "",
      attributes: claims.attributes ?? {},
      canPublish: grant.canPublish ?? true,
      canSubscribe: grant.canSubscribe ?? true,
      canPublishData: grant.canPublishData ?? true,
    };
  };
}
