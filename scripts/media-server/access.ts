import { AccessToken, TokenVerifier } from "livekit-server-sdk";

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

// Tokens the server hands out to replace the client's own, so a client that rejoins after its original
// short-lived token expired is still let in (livekit-client keeps the latest `refreshToken` for rejoining).
const REISSUED_TOKEN_TTL = "10m";

export interface AccessControl {
  /** Verifies a client's token; rejects with AccessRefused. */
  check(token: string | null): Promise<RoomAccess>;
  /** A fresh token carrying the same identity and room grant. */
  reissue(access: RoomAccess): Promise<string>;
}

export function createAccessControl(apiKey: string, apiSecret: string): AccessControl {
  const verifier = new TokenVerifier(apiKey, apiSecret);
  return {
    async check(token) {
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
    },
    reissue(access) {
      const token = new AccessToken(apiKey, apiSecret, {
        identity: access.identity,
        name: access.name,
        metadata: access.metadata,
        attributes: access.attributes,
        ttl: REISSUED_TOKEN_TTL,
      });
      token.addGrant({
        roomJoin: true,
        room: access.roomName,
        canPublish: access.canPublish,
        canSubscribe: access.canSubscribe,
        canPublishData: access.canPublishData,
      });
      return token.toJwt();
    },
  };
}
