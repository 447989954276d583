import { randomBytes } from "node:crypto";
import {
  DisconnectReason,
  LeaveRequest_Action,
  ParticipantInfo_State,
  Ping,
  SignalRequest,
  SignalResponse,
} from "@livekit/protocol";
import { AccessToken, TokenVerifier, type VideoGrant } from "livekit-server-sdk";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { WebSocket } from "ws";
import { type MediaServer, startMediaServer } from "./server";

// Checked against livekit-client 2.23.0 and @livekit/protocol 1.52.1 (the registry packages the browser uses):
// the signalling messages are built and read with the protocol's own generated classes, and tokens are minted
// with livekit-server-sdk's AccessToken, the same way the app's token route mints them.

const PORT = 7885;
const API_KEY = "test-key";
const API_SECRET = randomBytes(32).toString("hex");

let server: MediaServer;

beforeAll(async () => {
  server = await startMediaServer({ port: PORT, apiKey: API_KEY, apiSecret: API_SECRET });
});

afterAll(async () => {
  await server.close();
});

async function token(
  identity: string,
  grant: VideoGrant,
  options: { secret?: string; ttl?: string } = {},
): Promise<string> {
  const accessToken = new AccessToken(API_KEY, options.secret ?? API_SECRET, { identity, ttl: options.ttl ?? "5m" });
  accessToken.addGrant(grant);
  return accessToken.toJwt();
}

const httpBase = () => server.url.replace(/^ws/, "http");

type ResponseCase = NonNullable<SignalResponse["message"]["case"]>;
type ResponseValue<K extends ResponseCase> = Extract<SignalResponse["message"], { case: K }>["value"];

/** A bare signalling client: what livekit-client does on the WebSocket, without WebRTC. */
class SignalClient {
  readonly received: SignalResponse[] = [];
  private waiters: (() => void)[] = [];
  closed = false;

  private constructor(readonly socket: WebSocket) {
    socket.on("message", (data) => {
      this.received.push(SignalResponse.fromBinary(new Uint8Array(data as Buffer)));
      for (const wake of this.waiters.splice(0)) wake();
    });
    socket.on("close", () => {
      this.closed = true;
      for (const wake of this.waiters.splice(0)) wake();
    });
  }

  static open(jwt: string, extraQuery = ""): Promise<SignalClient> {
    const socket = new WebSocket(`${server.url}/rtc?access_token=${jwt}&auto_subscribe=1&protocol=16${extraQuery}`);
    return new Promise((resolve, reject) => {
      socket.once("open", () => resolve(new SignalClient(socket)));
      socket.once("unexpected-response", (_request, response) => reject(new Error(`HTTP ${response.statusCode}`)));
    });
  }

  send(message: SignalRequest["message"]): void {
    this.socket.send(new SignalRequest({ message }).toBinary());
  }

  /** The first message of this kind matching `where`, waiting up to 5 s. */
  async next<K extends ResponseCase>(kind: K, where: (value: ResponseValue<K>) => boolean = () => true): Promise<ResponseValue<K>> {
    const deadline = Date.now() + 5000;
    for (;;) {
      for (const { message } of this.received) {
        if (message.case === kind && where(message.value as ResponseValue<K>)) return message.value as ResponseValue<K>;
      }
      if (this.closed || Date.now() > deadline) throw new Error(`no ${kind} message arrived`);
      await new Promise<void>((resolve) => {
        this.waiters.push(resolve);
        setTimeout(resolve, 100);
      });
    }
  }

  waitClosed(): Promise<void> {
    return this.closed ? Promise.resolve() : new Promise((resolve) => this.socket.once("close", () => resolve()));
  }
}

/** Status of the WebSocket upgrade on the signalling path. */
function upgradeStatus(jwt: string): Promise<number> {
  return new Promise((resolve) => {
    const socket = new WebSocket(`${server.url}/rtc?access_token=${jwt}`);
    socket.once("unexpected-response", (_request, response) => resolve(response.statusCode ?? 0));
    socket.once("open", () => {
      socket.close();
      resolve(101);
    });
  });
}

describe("token checks (LiveKit access tokens: HS256 JWT signed with the API secret, video grant)", () => {
  const refusals: [string, () => Promise<string>][] = [
    ["a token signed with another secret", () => token("ana", { roomJoin: true, room: "r1" }, { secret: "x".repeat(64) })],
    ["an expired token", () => token("ana", { roomJoin: true, room: "r1" }, { ttl: "1 hour ago" })],
    ["a grant without roomJoin", () => token("ana", { roomList: true, room: "r1" })],
    ["a join grant that names no room", () => token("ana", { roomJoin: true })],
  ];

  it.each(refusals)("refuses %s with 401 on the socket and on the validate probe", async (_label, mint) => {
    const jwt = await mint();
    expect(await upgradeStatus(jwt)).toBe(401);
    const probe = await fetch(`${httpBase()}/rtc/validate?access_token=${jwt}`);
    expect(probe.status).toBe(401);
    expect(await probe.text()).toMatch(/^access_token: /);
  });

  it("refuses a missing token with 401 naming the parameter", async () => {
    const probe = await fetch(`${httpBase()}/rtc/validate`);
    expect(probe.status).toBe(401);
    expect(await probe.text()).toContain("access_token");
  });

  it("accepts a valid token, and turns the single-connection path away so the client falls back", async () => {
    const jwt = await token("ana", { roomJoin: true, room: "r1" });
    expect(await upgradeStatus(jwt)).toBe(101);
    expect((await fetch(`${httpBase()}/rtc/validate?access_token=${jwt}`)).status).toBe(200);
    const v1Probe = await fetch(`${httpBase()}/rtc/v1/validate?access_token=${jwt}`);
    // livekit-client 2.23.0 (SignalClient.handleConnectionError): a 404 whose body does not say
    // "requested room does not exist" means "fall back to /rtc".
    expect(v1Probe.status).toBe(404);
    // The probe comes from the page's origin, not the server's: the browser shows the status only with CORS.
    expect(v1Probe.headers.get("access-control-allow-origin")).toBe("*");
    expect(await v1Probe.text()).not.toContain("requested room does not exist");
  });
});

describe("signalling: join, roster, keepalive, rejoin", () => {
  it("answers join with the room and the others, and tells the others who joined and left", async () => {
    const ana = await SignalClient.open(await token("ana", { roomJoin: true, room: "roster" }));
    const anaJoin = await ana.next("join");
    expect(anaJoin.room?.name).toBe("roster");
    expect(anaJoin.participant?.identity).toBe("ana");
    expect(anaJoin.participant?.sid).toMatch(/^PA_/);
    expect(anaJoin.otherParticipants).toEqual([]);
    expect(anaJoin.subscriberPrimary).toBe(false);
    expect(anaJoin.pingInterval).toBeGreaterThan(0);

    const ben = await SignalClient.open(await token("ben", { roomJoin: true, room: "roster" }));
    const benJoin = await ben.next("join");
    expect(benJoin.room?.sid).toBe(anaJoin.room?.sid);
    expect(benJoin.otherParticipants.map((p) => p.identity)).toEqual(["ana"]);
    const benSid = benJoin.participant?.sid;
    await ana.next("update", (u) => u.participants.some((p) => p.sid === benSid && p.state === ParticipantInfo_State.ACTIVE));

    ben.socket.close();
    const left = await ana.next("update", (u) =>
      u.participants.some((p) => p.sid === benSid && p.state === ParticipantInfo_State.DISCONNECTED),
    );
    expect(left.participants[0].identity).toBe("ben");
    ana.socket.close();
  });

  it("answers ping with pong and pingReq with pongResp echoing the client's timestamp", async () => {
    const client = await SignalClient.open(await token("ana", { roomJoin: true, room: "keepalive" }));
    await client.next("join");
    client.send({ case: "ping", value: 1234n });
    expect(await client.next("pong")).toBeGreaterThan(0n);
    client.send({ case: "pingReq", value: new Ping({ timestamp: 987654321n, rtt: 20n }) });
    const pong = await client.next("pongResp");
    expect(pong.lastPingTimestamp).toBe(987654321n);
    client.socket.close();
  });

  it("ends a session whose client stops pinging for longer than the ping timeout it was given", async () => {
    // Only the interval timers and the clock are faked; the sockets run for real.
    vi.useFakeTimers({ toFake: ["setInterval", "Date"] });
    try {
      const client = await SignalClient.open(await token("ana", { roomJoin: true, room: "silent" }));
      const { pingTimeout } = await client.next("join");
      vi.advanceTimersByTime((pingTimeout - 5) * 1000);
      client.send({ case: "ping", value: BigInt(Date.now()) });
      await client.next("pong");
      vi.advanceTimersByTime((pingTimeout - 5) * 1000);
      // Long enough for a close to travel back over loopback, had the server ended the session.
      await new Promise((resolve) => setTimeout(resolve, 300));
      expect(client.closed).toBe(false);
      vi.advanceTimersByTime(10 * 1000);
      await client.waitClosed();
      expect(client.closed).toBe(true);
    } finally {
      vi.useRealTimers();
    }
  });

  it("hands the client a fresh token for the same identity and room, for rejoining after its own expires", async () => {
    const client = await SignalClient.open(await token("ana", { roomJoin: true, room: "refresh" }, { ttl: "1m" }));
    await client.next("join");
    const fresh = await new TokenVerifier(API_KEY, API_SECRET).verify(await client.next("refreshToken"));
    expect(fresh.sub).toBe("ana");
    expect(fresh.video).toMatchObject({ roomJoin: true, room: "refresh" });
    expect(fresh.exp! * 1000).toBeGreaterThan(Date.now() + 5 * 60 * 1000);
    client.socket.close();
  });

  it("answers a resume attempt (reconnect=1) with a leave asking for a full rejoin", async () => {
    const jwt = await token("ana", { roomJoin: true, room: "resume" });
    const first = await SignalClient.open(jwt);
    const sid = (await first.next("join")).participant?.sid;
    first.socket.terminate();
    const resume = await SignalClient.open(jwt, `&reconnect=1&sid=${sid}`);
    const leave = await resume.next("leave");
    expect(leave.action).toBe(LeaveRequest_Action.RECONNECT);
    expect(leave.canReconnect).toBe(true);
    await resume.waitClosed();
  });

  it("lets a client rejoin under the same identity, replacing its stale session", async () => {
    const ben = await SignalClient.open(await token("ben", { roomJoin: true, room: "rejoin" }));
    await ben.next("join");
    const anaToken = await token("ana", { roomJoin: true, room: "rejoin" });
    const stale = await SignalClient.open(anaToken);
    const staleSid = (await stale.next("join")).participant?.sid;
    const fresh = await SignalClient.open(anaToken);
    const freshJoin = await fresh.next("join");
    expect(freshJoin.participant?.sid).not.toBe(staleSid);
    expect(freshJoin.otherParticipants.map((p) => p.identity)).toEqual(["ben"]);
    expect((await stale.next("leave")).reason).toBe(DisconnectReason.DUPLICATE_IDENTITY);
    await stale.waitClosed();
    await ben.next("update", (u) =>
      u.participants.some((p) => p.sid === staleSid && p.state === ParticipantInfo_State.DISCONNECTED),
    );
    await ben.next("update", (u) => u.participants.some((p) => p.sid === freshJoin.participant?.sid));
    ben.socket.close();
    fresh.socket.close();
  });
});
