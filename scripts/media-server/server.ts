import { STATUS_CODES, createServer, type IncomingMessage, type ServerResponse } from "node:http";
import type { Duplex } from "node:stream";
import { DisconnectReason, LeaveRequest, LeaveRequest_Action, SignalResponse } from "@livekit/protocol";
import { type WebSocket, WebSocketServer } from "ws";
import { type AccessControl, AccessRefused, type RoomAccess, createAccessControl } from "./access";
import { Participant } from "./participant";
import { Room } from "./room";

export interface MediaServerOptions {
  port: number;
  apiKey: string;
  apiSecret: string;
}

export interface MediaServer {
  /** The WebSocket URL to hand to livekit-client's `Room.connect`. */
  url: string;
  close(): Promise<void>;
}

// livekit-client's two-connection signalling path. Its default single-connection path (/rtc/v1) is not served:
// the client then asks /rtc/v1/validate, reads the 404 as "older server" and falls back to /rtc.
const SIGNAL_PATH = "/rtc";
const SINGLE_CONNECTION_PATH = "/rtc/v1";

/**
 * Starts the development stand-in for a LiveKit server on the loopback interface only: its development secret
 * is in the repository, so anyone who could reach it could mint tokens and watch a developer's camera.
 */
export async function startMediaServer({ port, apiKey, apiSecret }: MediaServerOptions): Promise<MediaServer> {
  const access = createAccessControl(apiKey, apiSecret);
  const rooms = new Map<string, Room>();
  const sockets = new WebSocketServer({ noServer: true });

  const admit = (socket: WebSocket, granted: RoomAccess, query: URLSearchParams) => {
    if (query.get("reconnect") === "1") {
      // Resuming a session (keeping the peer connections across a new socket) is not supported: tell the
      // client to rejoin from scratch, which livekit-client does at once.
      refuseResume(socket);
      return;
    }
    let room = rooms.get(granted.roomName);
    if (!room) {
      room = new Room(granted.roomName, (empty) => rooms.delete(empty.name));
      rooms.set(granted.roomName, room);
    }
    room.join(new Participant(socket, granted, room, () => access.reissue(granted)));
  };

  const http = createServer((request, response) => {
    void answerHttp(request, response, access);
  });
  http.on("upgrade", (request: IncomingMessage, stream: Duplex, head: Buffer) => {
    const url = new URL(request.url ?? "/", "http://localhost");
    if (url.pathname !== SIGNAL_PATH) {
      rejectUpgrade(stream, 404, `no signalling on ${url.pathname}; livekit-client falls back to ${SIGNAL_PATH}`);
      return;
    }
    access.check(url.searchParams.get("access_token")).then(
      (granted) => sockets.handleUpgrade(request, stream, head, (socket) => admit(socket, granted, url.searchParams)),
      (error: unknown) => rejectUpgrade(stream, ...refusal(error)),
    );
  });

  await new Promise<void>((resolve, reject) => {
    http.once("error", reject);
    http.listen(port, "127.0.0.1", () => resolve());
  });

  return {
    url: `ws://localhost:${port}`,
    close: async () => {
      for (const socket of sockets.clients) socket.close(1001, "media server shutting down");
      sockets.close();
      http.closeAllConnections();
      await new Promise<void>((resolve) => http.close(() => resolve()));
    },
  };
}

/** GET …/validate: what livekit-client asks after a failed upgrade, to learn why it failed. */
async function answerHttp(request: IncomingMessage, response: ServerResponse, access: AccessControl): Promise<void> {
  const url = new URL(request.url ?? "/", "http://localhost");
  const reply = (status: number, body: string) => {
    // The probe comes from the app's page, another origin; without this header the browser hides the
    // status and the client reports the server unreachable instead of falling back.
    response.writeHead(status, { "content-type": "text/plain; charset=utf-8", "access-control-allow-origin": "*" });
    response.end(body);
  };
  if (request.method !== "GET") return reply(405, "only GET is served");
  if (url.pathname === "/") return reply(200, "Kinarc development media server (a LiveKit stand-in, not for production)");
  if (url.pathname !== `${SIGNAL_PATH}/validate` && url.pathname !== `${SINGLE_CONNECTION_PATH}/validate`) {
    return reply(404, "not found");
  }
  try {
    await access.check(url.searchParams.get("access_token"));
  } catch (error) {
    return reply(...refusal(error));
  }
  if (url.pathname === `${SINGLE_CONNECTION_PATH}/validate`) {
    return reply(404, `single peer connection signalling is not served; use ${SIGNAL_PATH}`);
  }
  return reply(200, "success");
}

function refusal(error: unknown): [number, string] {
  if (error instanceof AccessRefused) return [401, error.message];
  console.error("media-server: access check failed", error);
  return [500, "access check failed"];
}

function rejectUpgrade(stream: Duplex, status: number, message: string): void {
  const head = [
    `HTTP/1.1 ${status} ${STATUS_CODES[status]}`,
    "Content-Type: text/plain; charset=utf-8",
    `Content-Length: ${Buffer.byteLength(message)}`,
    "Connection: close",
  ];
  stream.end(`${head.join("\r\n")}\r\n\r\n${message}`);
}

function refuseResume(socket: WebSocket): void {
  const leave = new LeaveRequest({
    canReconnect: true,
    reason: DisconnectReason.UNKNOWN_REASON,
    action: LeaveRequest_Action.RECONNECT,
  });
  socket.send(new SignalResponse({ message: { case: "leave", value: leave } }).toBinary());
  socket.close(1000, "rejoin instead of resuming");
}
